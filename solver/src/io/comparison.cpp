#include "plystrain/solver/comparison.hpp"

#include "plystrain/solver/atomic_file.hpp"
#include "plystrain/solver/results_writers.hpp"

#include <nlohmann/json.hpp>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <limits>
#include <set>
#include <stdexcept>

namespace plystrain {

namespace {

using Json = nlohmann::ordered_json;

bool nearly_equal(double a, double b) {
  return a == b || std::abs(a - b) <= 1e-9 * std::max(std::abs(a), std::abs(b));
}

double margin_or_lowest(const ComparisonEntry& entry) {
  return entry.crack_margin ? *entry.crack_margin : -std::numeric_limits<double>::infinity();
}

bool margins_equal(const ComparisonEntry& a, const ComparisonEntry& b) {
  if (!a.crack_margin || !b.crack_margin) {
    return !a.crack_margin && !b.crack_margin;
  }
  return nearly_equal(*a.crack_margin, *b.crack_margin);
}

bool can_be_best(const ComparisonEntry& entry) {
  return entry.present && entry.completed && entry.peak_strain && std::isfinite(*entry.peak_strain);
}

void mark_best(std::vector<ComparisonEntry*>& candidates) {
  std::erase_if(candidates, [](const ComparisonEntry* entry) { return !can_be_best(*entry); });
  if (candidates.empty()) {
    return;
  }
  double lowest = std::numeric_limits<double>::infinity();
  for (const ComparisonEntry* entry : candidates) {
    lowest = std::min(lowest, *entry->peak_strain);
  }
  std::erase_if(candidates, [lowest](const ComparisonEntry* entry) {
    return !nearly_equal(*entry->peak_strain, lowest);
  });
  const ComparisonEntry* widest = *std::max_element(
      candidates.begin(), candidates.end(), [](const ComparisonEntry* a, const ComparisonEntry* b) {
        return margin_or_lowest(*a) < margin_or_lowest(*b);
      });
  for (ComparisonEntry* entry : candidates) {
    entry->best = margins_equal(*entry, *widest);
  }
}

Json optional_number(const std::optional<double>& value) {
  return value && std::isfinite(*value) ? Json(*value) : Json(nullptr);
}

std::string csv_number(const std::optional<double>& value) {
  return value ? round_trip_number(*value) : std::string();
}

std::string verdict_label(const ComparisonEntry& entry) {
  if (!entry.present) {
    return "absent";
  }
  return verdict_name(entry.verdict.value_or(Verdict::unknown));
}

std::string printf_number(const char* format, double value) {
  if (!std::isfinite(value)) {
    return std::isnan(value) ? "nan" : (value > 0 ? "inf" : "-inf");
  }
  char buffer[64];
  std::snprintf(buffer, sizeof buffer, format, value);
  return buffer;
}

std::string shown(const std::optional<double>& value, const char* format, double factor) {
  return value ? printf_number(format, factor * *value) : std::string("-");
}

std::string render_table(const std::vector<std::string>& headers,
                         const std::vector<std::vector<std::string>>& rows) {
  std::vector<std::size_t> widths(headers.size());
  for (std::size_t c = 0; c < headers.size(); ++c) {
    widths[c] = headers[c].size();
    for (const auto& row : rows) {
      widths[c] = std::max(widths[c], row[c].size());
    }
  }
  const auto line = [&widths](const std::vector<std::string>& cells) {
    std::string text = "  ";
    for (std::size_t c = 0; c < cells.size(); ++c) {
      text += cells[c] + std::string(widths[c] - cells[c].size() + 2, ' ');
    }
    while (!text.empty() && text.back() == ' ') {
      text.pop_back();
    }
    return text + "\n";
  };
  std::string out = line(headers);
  for (const auto& row : rows) {
    out += line(row);
  }
  return out;
}

}  // namespace

const ComparisonEntry& Comparison::entry(const std::string& run, const std::string& layer) const {
  for (const ComparisonEntry& candidate : entries) {
    if (candidate.run == run && candidate.layer == layer) {
      return candidate;
    }
  }
  throw std::out_of_range(std::string("comparison has no entry for run ") + run + " and layer " +
                          layer);
}

Comparison compare_runs(const RunResults& base, const std::vector<NamedRun>& variants) {
  std::vector<std::pair<std::string, const RunResults*>> runs = {{"base", &base}};
  for (const NamedRun& variant : variants) {
    runs.emplace_back(variant.name, &variant.results);
  }
  std::set<std::string> names;
  for (const auto& [name, results] : runs) {
    if (!names.insert(name).second) {
      throw std::invalid_argument(std::string("comparison: two runs are named \"") + name + "\"");
    }
  }

  Comparison comparison;
  std::vector<std::vector<LayerResult>> governing;
  for (const auto& [name, results] : runs) {
    comparison.runs.push_back({name, results->completed, results->load_reached, results->message});
    governing.push_back(governing_layers(*results));
    for (const LayerResult& layer : governing.back()) {
      if (std::find(comparison.layers.begin(), comparison.layers.end(), layer.name) ==
          comparison.layers.end()) {
        comparison.layers.push_back(layer.name);
      }
    }
  }

  for (std::size_t r = 0; r < runs.size(); ++r) {
    for (const std::string& layer_name : comparison.layers) {
      ComparisonEntry entry;
      entry.run = runs[r].first;
      entry.layer = layer_name;
      entry.completed = runs[r].second->completed;
      const auto found = std::find_if(
          governing[r].begin(), governing[r].end(),
          [&layer_name](const LayerResult& layer) { return layer.name == layer_name; });
      if (found != governing[r].end()) {
        entry.present = true;
        entry.peak_strain = found->peak_strain;
        entry.concentration = found->concentration;
        entry.crack_margin = found->crack_margin;
        entry.verdict = found->verdict;
      }
      comparison.entries.push_back(entry);
    }
  }

  for (const std::string& layer_name : comparison.layers) {
    std::vector<ComparisonEntry*> candidates;
    for (ComparisonEntry& entry : comparison.entries) {
      if (entry.layer == layer_name) {
        candidates.push_back(&entry);
      }
    }
    mark_best(candidates);
  }
  return comparison;
}

std::string comparison_json_text(const Comparison& comparison) {
  Json out;
  out["format"] = 1;
  Json runs = Json::array();
  for (const RunOutline& run : comparison.runs) {
    runs.push_back(Json{{"name", run.name},
                        {"completed", run.completed},
                        {"load_reached", optional_number(run.load_reached)},
                        {"message", run.message}});
  }
  out["runs"] = runs;
  out["layers"] = comparison.layers;
  Json best = Json::object();
  for (const std::string& layer : comparison.layers) {
    Json names = Json::array();
    for (const ComparisonEntry& entry : comparison.entries) {
      if (entry.layer == layer && entry.best) {
        names.push_back(entry.run);
      }
    }
    best[layer] = names;
  }
  out["best"] = best;
  Json rows = Json::array();
  for (const ComparisonEntry& entry : comparison.entries) {
    rows.push_back(Json{{"variant", entry.run},
                        {"layer", entry.layer},
                        {"present", entry.present},
                        {"peak_strain", optional_number(entry.peak_strain)},
                        {"concentration", optional_number(entry.concentration)},
                        {"crack_margin", optional_number(entry.crack_margin)},
                        {"verdict", entry.present ? Json(verdict_label(entry)) : Json(nullptr)},
                        {"best", entry.best},
                        {"completed", entry.completed}});
  }
  out["rows"] = rows;
  return out.dump(2, ' ', false, Json::error_handler_t::replace) + "\n";
}

std::string comparison_csv_text(const Comparison& comparison) {
  std::string out = "variant,layer,peak_strain,concentration,crack_margin,verdict,best,completed\n";
  for (const ComparisonEntry& entry : comparison.entries) {
    out += csv_field(entry.run) + "," + csv_field(entry.layer) + "," +
           csv_number(entry.peak_strain) + "," + csv_number(entry.concentration) + "," +
           csv_number(entry.crack_margin) + "," + verdict_label(entry) + "," +
           (entry.best ? "true" : "false") + "," + (entry.completed ? "true" : "false") + "\n";
  }
  return out;
}

std::string comparison_text(const Comparison& comparison) {
  std::string out =
      std::string("Comparison of ") + std::to_string(comparison.runs.size()) +
      " runs. Peak strain: largest principal nominal strain in %; margin: 1 - peak / crack "
      "onset. The best run of a layer has the lowest peak among the runs that completed.\n\n";
  std::vector<std::vector<std::string>> run_rows;
  for (const RunOutline& run : comparison.runs) {
    run_rows.push_back(
        {run.name, run.completed
                       ? std::string("completed")
                       : std::string("STOPPED EARLY at load factor ") +
                             printf_number("%.4g", run.load_reached) +
                             (run.message.empty() ? "" : std::string(": ") + run.message)});
  }
  out += render_table({"run", "status"}, run_rows);
  for (const std::string& layer : comparison.layers) {
    out += std::string("\nLayer ") + layer + "\n";
    std::vector<std::vector<std::string>> rows;
    for (const ComparisonEntry& entry : comparison.entries) {
      if (entry.layer != layer) {
        continue;
      }
      if (!entry.present) {
        rows.push_back({entry.run, "absent", "", "", "", ""});
        continue;
      }
      const Verdict verdict = entry.verdict.value_or(Verdict::unknown);
      rows.push_back({entry.run, shown(entry.peak_strain, "%.3f", 100.0),
                      shown(entry.concentration, "%.3g", 1.0),
                      shown(entry.crack_margin, "%+.3f", 1.0),
                      verdict == Verdict::cracks ? "CRACKS" : verdict_name(verdict),
                      entry.best ? "<- best" : ""});
    }
    out += render_table({"run", "peak %", "conc.", "margin", "verdict", ""}, rows);
  }
  return out;
}

void write_comparison_files(const std::filesystem::path& directory, const Comparison& comparison) {
  write_file_atomically(directory / "comparison.json", comparison_json_text(comparison));
  write_file_atomically(directory / "comparison.csv", comparison_csv_text(comparison));
  write_file_atomically(directory / "comparison.txt", comparison_text(comparison));
}

}  // namespace plystrain
