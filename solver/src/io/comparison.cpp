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

// -1 when `a` ranks below `b`, 0 when they tie, 1 when above: a wider
// margin ranks higher, a margin ranks above none, two absent margins tie.
int rank_margins(const std::optional<double>& a, const std::optional<double>& b) {
  if (!a || !b) {
    return (a ? 1 : 0) - (b ? 1 : 0);
  }
  if (nearly_equal(*a, *b)) {
    return 0;
  }
  return *a > *b ? 1 : -1;
}

// The order of the best run: crack margin, then yield margin, then the
// lower peak strain.
int rank(const ComparisonEntry& a, const ComparisonEntry& b) {
  if (const int by_crack = rank_margins(a.crack_margin, b.crack_margin); by_crack != 0) {
    return by_crack;
  }
  if (const int by_yield = rank_margins(a.yield_margin, b.yield_margin); by_yield != 0) {
    return by_yield;
  }
  if (nearly_equal(*a.peak_strain, *b.peak_strain)) {
    return 0;
  }
  return *a.peak_strain < *b.peak_strain ? 1 : -1;
}

bool can_be_best(const ComparisonEntry& entry) {
  return entry.present && entry.completed && entry.peak_strain && std::isfinite(*entry.peak_strain);
}

void mark_best(std::vector<ComparisonEntry*>& candidates) {
  std::erase_if(candidates, [](const ComparisonEntry* entry) { return !can_be_best(*entry); });
  if (candidates.empty()) {
    return;
  }
  const ComparisonEntry* top = *std::max_element(
      candidates.begin(), candidates.end(),
      [](const ComparisonEntry* a, const ComparisonEntry* b) { return rank(*a, *b) < 0; });
  for (ComparisonEntry* entry : candidates) {
    entry->best = rank(*entry, *top) == 0;
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
  std::vector<NamedRun> runs = {NamedRun{"base", base}};
  runs.insert(runs.end(), variants.begin(), variants.end());
  return compare_runs(runs);
}

Comparison compare_runs(const std::vector<NamedRun>& named_runs) {
  std::vector<std::pair<std::string, const RunResults*>> runs;
  for (const NamedRun& run : named_runs) {
    runs.emplace_back(run.name, &run.results);
  }
  std::set<std::string> names;
  for (const auto& [name, results] : runs) {
    if (!names.insert(name).second) {
      throw std::invalid_argument(std::string("comparison: two runs are named \"") + name + "\"");
    }
  }

  Comparison comparison;
  std::vector<std::vector<LayerResult>> governing;
  for (std::size_t r = 0; r < runs.size(); ++r) {
    const RunResults* results = runs[r].second;
    comparison.runs.push_back({runs[r].first, results->completed, results->load_reached,
                               results->message, "", headline(*results),
                               overall_verdict(*results)});
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
        entry.yield_margin = found->yield_margin;
        entry.crack_onset_load_factor = found->crack_onset_load_factor;
        entry.yield_load_factor = found->yield_load_factor;
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
                        {"message", run.message},
                        {"headline", run.headline},
                        {"verdict", verdict_name(run.verdict)}});
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
                        {"completed", entry.completed},
                        {"yield_margin", optional_number(entry.yield_margin)},
                        {"crack_onset_load_factor", optional_number(entry.crack_onset_load_factor)},
                        {"yield_load_factor", optional_number(entry.yield_load_factor)}});
  }
  out["rows"] = rows;
  return out.dump(2, ' ', false, Json::error_handler_t::replace) + "\n";
}

std::string comparison_csv_text(const Comparison& comparison) {
  std::string out =
      "variant,layer,peak_strain,concentration,crack_margin,verdict,best,completed,yield_margin,"
      "crack_onset_load_factor,yield_load_factor\n";
  for (const ComparisonEntry& entry : comparison.entries) {
    out += csv_field(entry.run) + "," + csv_field(entry.layer) + "," +
           csv_number(entry.peak_strain) + "," + csv_number(entry.concentration) + "," +
           csv_number(entry.crack_margin) + "," + verdict_label(entry) + "," +
           (entry.best ? "true" : "false") + "," + (entry.completed ? "true" : "false") + "," +
           csv_number(entry.yield_margin) + "," + csv_number(entry.crack_onset_load_factor) + "," +
           csv_number(entry.yield_load_factor) + "\n";
  }
  return out;
}

std::string comparison_text(const Comparison& comparison) {
  std::string out =
      std::string("Comparison of ") + std::to_string(comparison.runs.size()) +
      " runs. Peak: largest principal nominal strain in %; margins: 1 - peak / limit;\ncrack at: "
      "the share of the full load at which the peak first reached crack onset. The best run\nof a "
      "layer has the widest crack margin among the runs that completed (then the widest yield\n"
      "margin, then the lowest peak).\n\n";
  const bool with_values = std::any_of(comparison.runs.begin(), comparison.runs.end(),
                                       [](const RunOutline& run) { return !run.value.empty(); });
  std::vector<std::vector<std::string>> run_rows;
  for (const RunOutline& run : comparison.runs) {
    std::vector<std::string> row = {run.name};
    if (with_values) {
      row.push_back(run.value);
    }
    row.push_back(run.completed ? run.headline
                                : std::string("STOPPED EARLY at load factor ") +
                                      printf_number("%.4g", run.load_reached) +
                                      (run.message.empty() ? "" : std::string(": ") + run.message));
    run_rows.push_back(row);
  }
  out += render_table(with_values ? std::vector<std::string>{"run", "value", "status"}
                                  : std::vector<std::string>{"run", "status"},
                      run_rows);
  for (const std::string& layer : comparison.layers) {
    out += std::string("\nLayer ") + layer + "\n";
    std::vector<std::vector<std::string>> rows;
    for (const ComparisonEntry& entry : comparison.entries) {
      if (entry.layer != layer) {
        continue;
      }
      if (!entry.present) {
        rows.push_back({entry.run, "absent", "", "", "", "", "", ""});
        continue;
      }
      const Verdict verdict = entry.verdict.value_or(Verdict::unknown);
      rows.push_back({entry.run, shown(entry.peak_strain, "%.3f", 100.0),
                      shown(entry.concentration, "%.3g", 1.0),
                      shown(entry.crack_margin, "%+.3f", 1.0),
                      shown(entry.yield_margin, "%+.3f", 1.0),
                      shown(entry.crack_onset_load_factor, "%.3g", 100.0), verdict_text(verdict),
                      entry.best ? "<- best" : ""});
    }
    out += render_table({"run", "peak %", "conc.", "crack margin", "yield margin",
                         "crack at load %", "verdict", ""},
                        rows);
  }
  return out;
}

void write_comparison_files(const std::filesystem::path& directory, const Comparison& comparison) {
  write_file_atomically(directory / "comparison.json", comparison_json_text(comparison));
  write_file_atomically(directory / "comparison.csv", comparison_csv_text(comparison));
  write_file_atomically(directory / "comparison.txt", comparison_text(comparison));
}

std::string sweep_csv_text(const Comparison& sweep, const std::string& parameter) {
  std::string out =
      "run,parameter,value,layer,peak_strain,concentration,crack_margin,yield_margin,verdict,"
      "crack_onset_load_factor,yield_load_factor,best,completed\n";
  for (const ComparisonEntry& entry : sweep.entries) {
    const auto run = std::find_if(sweep.runs.begin(), sweep.runs.end(),
                                  [&entry](const RunOutline& r) { return r.name == entry.run; });
    const std::string value = run == sweep.runs.end() ? std::string() : run->value;
    out += csv_field(entry.run) + "," + csv_field(parameter) + "," + csv_field(value) + "," +
           csv_field(entry.layer) + "," + csv_number(entry.peak_strain) + "," +
           csv_number(entry.concentration) + "," + csv_number(entry.crack_margin) + "," +
           csv_number(entry.yield_margin) + "," + verdict_label(entry) + "," +
           csv_number(entry.crack_onset_load_factor) + "," + csv_number(entry.yield_load_factor) +
           "," + (entry.best ? "true" : "false") + "," + (entry.completed ? "true" : "false") +
           "\n";
  }
  return out;
}

std::string sweep_json_text(const Comparison& sweep, const std::string& parameter) {
  // The comparison document with the parameter, and each run's and row's
  // value beside its name.
  Json out = Json::parse(comparison_json_text(sweep));
  Json document;
  document["format"] = 1;
  document["parameter"] = parameter;
  for (std::size_t r = 0; r < sweep.runs.size(); ++r) {
    Json& run = out["runs"][r];
    Json entry;
    entry["name"] = run["name"];
    entry["value"] = sweep.runs[r].value;
    for (auto item = run.begin(); item != run.end(); ++item) {
      if (item.key() != "name") {
        entry[item.key()] = item.value();
      }
    }
    run = entry;
  }
  document["runs"] = out["runs"];
  document["layers"] = out["layers"];
  document["best"] = out["best"];
  Json rows = Json::array();
  for (const Json& row : out["rows"]) {
    Json entry;
    entry["run"] = row["variant"];
    const auto run = std::find_if(sweep.runs.begin(), sweep.runs.end(),
                                  [&row](const RunOutline& r) { return row["variant"] == r.name; });
    entry["value"] = run == sweep.runs.end() ? std::string() : run->value;
    for (auto item = row.begin(); item != row.end(); ++item) {
      if (item.key() != "variant") {
        entry[item.key()] = item.value();
      }
    }
    rows.push_back(entry);
  }
  document["rows"] = rows;
  return document.dump(2, ' ', false, Json::error_handler_t::replace) + "\n";
}

void write_sweep_files(const std::filesystem::path& directory, const Comparison& sweep,
                       const std::string& parameter) {
  write_file_atomically(directory / "sweep.json", sweep_json_text(sweep, parameter));
  write_file_atomically(directory / "sweep.csv", sweep_csv_text(sweep, parameter));
  write_file_atomically(directory / "sweep.txt", comparison_text(sweep));
}

}  // namespace plystrain
