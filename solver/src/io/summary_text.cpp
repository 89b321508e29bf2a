#include "plystrain/solver/atomic_file.hpp"
#include "plystrain/solver/results_writers.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <stdexcept>
#include <string>
#include <vector>

namespace plystrain {

std::vector<std::string> standard_cautions() {
  return {
      "These figures are model estimates: a finite-strain finite-element analysis of an idealised "
      "cross-section with the material values listed. They do not replace physical testing of "
      "the actual stack, the standards that apply to the product, or review by a qualified "
      "engineer.",
      "Crack-onset and yield strains of thin films depend on processing, thickness, substrate and "
      "test method; check the basis of each material value before relying on a margin.",
      "Products worn on or implanted in the body need their own safety and biocompatibility "
      "evaluation; nothing in this report addresses it.",
  };
}

std::vector<std::string> cautions_to_report(const RunResults& run) {
  std::vector<std::string> cautions = run.cautions;
  for (std::string& caution : standard_cautions()) {
    if (std::find(cautions.begin(), cautions.end(), caution) == cautions.end()) {
      cautions.push_back(std::move(caution));
    }
  }
  return cautions;
}

namespace {

std::string printf_number(const char* format, double value) {
  if (!std::isfinite(value)) {
    return std::isnan(value) ? "nan" : (value > 0 ? "inf" : "-inf");
  }
  char buffer[64];
  std::snprintf(buffer, sizeof buffer, format, value);
  return buffer;
}

std::string percent(double fraction) {
  return printf_number("%.3f", 100.0 * fraction);
}

std::string optional_text(const std::optional<double>& value, std::string (*format)(double)) {
  return value ? format(*value) : std::string("-");
}

std::string general(double value) {
  return printf_number("%.4g", value);
}
std::string ratio(double value) {
  return printf_number("%.3g", value);
}
std::string margin(double value) {
  return printf_number("%+.3f", value);
}

std::string place(const std::array<double, 2>& micrometres, const OutputUnit& unit) {
  return std::string("(") + printf_number("%.6g", micrometres[0] / unit.length_scale) + ", " +
         printf_number("%.6g", micrometres[1] / unit.length_scale) + ")";
}

// Load factor as a percentage of the full load; "-" when the limit was not
// reached.
std::string load_share(const std::optional<double>& load_factor) {
  return load_factor ? printf_number("%.3g", 100.0 * *load_factor) : std::string("-");
}

struct Column {
  std::string header;
  bool numeric = false;
};

// Text table: numeric columns right-aligned, others left-aligned. A
// non-empty `top` is a header line above the column names (one entry per
// column), so that columns can stay narrow.
std::string render_table(const std::vector<Column>& columns,
                         const std::vector<std::vector<std::string>>& rows,
                         const std::vector<std::string>& top = {}) {
  std::vector<std::size_t> widths(columns.size(), 0);
  for (std::size_t c = 0; c < columns.size(); ++c) {
    widths[c] = std::max(columns[c].header.size(), top.empty() ? 0 : top[c].size());
    for (const auto& row : rows) {
      widths[c] = std::max(widths[c], row[c].size());
    }
  }
  const auto line = [&](const std::vector<std::string>& cells) {
    std::string text = "  ";
    for (std::size_t c = 0; c < columns.size(); ++c) {
      const std::string padding(widths[c] - cells[c].size(), ' ');
      text += columns[c].numeric ? padding + cells[c] : cells[c] + padding;
      text += c + 1 < columns.size() ? "  " : "";
    }
    while (!text.empty() && text.back() == ' ') {
      text.pop_back();
    }
    return text + "\n";
  };
  std::vector<std::string> headers;
  for (const Column& column : columns) {
    headers.push_back(column.header);
  }
  std::string out = top.empty() ? std::string() : line(top);
  out += line(headers);
  for (const auto& row : rows) {
    out += line(row);
  }
  return out;
}

// The verdicts at a glance: peak, concentration, most compressive strain,
// both margins, the load at which each limit was first reached, verdict.
std::string layer_table(const std::vector<LayerResult>& layers) {
  const std::vector<std::string> top = {"",      "",      "peak",     "",         "min",
                                        "crack", "yield", "crack at", "yield at", ""};
  const std::vector<Column> columns = {
      {"", false},      {"layer", false}, {"%", true},      {"conc.", true},  {"%", true},
      {"margin", true}, {"margin", true}, {"load %", true}, {"load %", true}, {"verdict", false},
  };
  std::vector<std::vector<std::string>> rows;
  for (const LayerResult& layer : layers) {
    rows.push_back({
        layer.verdict == Verdict::cracks ? ">>" : "",
        layer.name,
        percent(layer.peak_strain),
        optional_text(layer.concentration, ratio),
        percent(layer.min_strain),
        optional_text(layer.crack_margin, margin),
        optional_text(layer.yield_margin, margin),
        load_share(layer.crack_onset_load_factor),
        load_share(layer.yield_load_factor),
        verdict_text(layer.verdict),
    });
  }
  return render_table(columns, rows, top);
}

// What the verdicts rest on: where the peak is, the undisturbed strain, the stress
// there, the material's crack-onset and yield strains and their basis.
std::string detail_table(const std::vector<LayerResult>& layers, const OutputUnit& unit) {
  const std::vector<Column> columns = {
      {"layer", false},      {std::string("peak at (x, z) ") + unit.name, false},
      {"undisturbed %", true}, {"stress MPa", true},
      {"onset %", true},     {"yield %", true},
      {"basis", false},
  };
  std::vector<std::vector<std::string>> rows;
  for (const LayerResult& layer : layers) {
    rows.push_back({
        layer.name,
        place(layer.peak_at, unit),
        percent(layer.far_field_strain),
        general(layer.peak_stress),
        optional_text(layer.crack_onset_strain, percent),
        optional_text(layer.yield_strain, percent),
        layer.basis,
    });
  }
  return render_table(columns, rows);
}

std::string layer_tables(const std::vector<LayerResult>& layers, const OutputUnit& unit) {
  return layer_table(layers) + "\n" + detail_table(layers, unit);
}

std::string cracked_line(const RunResults& run) {
  std::string names;
  for (const LayerResult& layer : governing_layers(run)) {
    if (layer.verdict != Verdict::cracks) {
      continue;
    }
    names += names.empty() ? "" : "; ";
    names += layer.name + " (peak " + percent(layer.peak_strain) + " %";
    if (layer.crack_onset_strain) {
      names += std::string(" >= crack onset ") + percent(*layer.crack_onset_strain) + " %";
    }
    names += ")";
  }
  if (names.empty()) {
    return "No layer reaches its crack-onset strain.\n";
  }
  return std::string("CRACKS: expected to crack: ") + names + ".\n";
}

std::string conform_section(const ConformResult& conform, const OutputUnit& unit) {
  std::string out =
      std::string("Conforming to the ") + conform.surface + " surface (" + conform.method +
      std::string("): contact over ") + percent(conform.contact_fraction) +
      std::string(" % of it, largest penetration ") +
      printf_number("%.4g", conform.max_penetration / unit.length_scale) + " " + unit.name + ".\n";
  std::vector<std::vector<std::string>> rows;
  for (const RequiredStrain& entry : conform.required_strain) {
    rows.push_back({entry.layer, percent(entry.max), place(entry.at, unit), percent(entry.min)});
  }
  out += render_table({{"layer", false},
                       {"required max %", true},
                       {std::string("at (x, z) ") + unit.name, false},
                       {"required min %", true}},
                      rows);
  return out;
}

std::string completion_line(const RunResults& run) {
  if (run.completed) {
    return std::string("Completed: the full load was applied (load factor ") +
           general(run.load_reached) + ").\n";
  }
  std::string reason = run.message.empty() ? std::string("no reason was given") : run.message;
  return std::string("STOPPED EARLY at load factor ") + general(run.load_reached) +
         std::string(" of the full load: ") + reason +
         ". The figures above are for the last converged increment.\n";
}

// The modelled cell: how wide, why, and whether it isolates the defects.
std::string cell_line(const RunResults& run, const OutputUnit& unit) {
  if (run.defects.empty()) {
    return {};
  }
  std::string out = std::string("Cell: half-width ") +
                    printf_number("%.4g", run.cell.width / unit.length_scale) + " " + unit.name;
  if (run.cell.width_basis == "isolating") {
    out += " (chosen to isolate the defects)";
  } else if (run.cell.width_basis == "defect spacing") {
    out += " (a row of defects at the stated spacing)";
  } else {
    out += " (as given)";
  }
  if (run.cell.edge_disturbance) {
    out += std::string("; the defects change the strain at its edge by ") +
           printf_number("%.2g", 100.0 * *run.cell.edge_disturbance) + " %";
  }
  return out + ".\n";
}

}  // namespace

std::string format_results_table(const RunResults& run, const OutputUnit& unit) {
  if (!(unit.length_scale > 0.0) || !std::isfinite(unit.length_scale)) {
    throw std::invalid_argument("summary: the length scale must be positive and finite");
  }
  std::string out = headline(run) + "\n\n";
  out += run.title.empty() ? std::string() : run.title + "\n";
  out += std::string("Case ") + run.case_file + ": " + run.shape + ", " + run.load;
  out += run.lateral.empty() ? std::string() : std::string(", lateral ") + run.lateral;
  out +=
      std::string(
          ". Strains are nominal principal strains in %, stresses Cauchy in MPa, lengths in ") +
      unit.name +
      ".\nMargins: 1 - peak / limit, negative past the limit. Crack at / yield at: the share "
      "of the full\nload at which the peak first reached the crack-onset / the yield strain.\n\n";
  out += layer_tables(run.layers, unit);
  for (const LocalCheck& check : run.local) {
    out += std::string("\nLocal check at defect ") + std::to_string(check.defect_index) +
           std::string(" (applied major ") + percent(check.applied_major) + " %, minor " +
           percent(check.applied_minor) + " % at " + place(check.applied_at, unit) + "):\n";
    out += layer_tables(check.layers, unit);
  }
  if (run.conform) {
    out += std::string("\n") + conform_section(*run.conform, unit);
  }
  out += std::string("\n") + cracked_line(run);
  out += completion_line(run);
  out += cell_line(run, unit);
  if (run.verification) {
    out += std::string("Convergence check: ") + run.verification->verdict + ".\n";
    for (const ConvergenceRerun& rerun : run.verification->reruns) {
      out += std::string("  ") + rerun.what + ": largest change " +
             printf_number("%.2f", 100.0 * rerun.largest_change) + " %" +
             (rerun.completed ? std::string() : std::string(" (the rerun stopped early)")) + "\n";
    }
  }
  out += std::string("Mesh: ") + std::to_string(run.mesh.nodes) + " nodes, " +
         std::to_string(run.mesh.elements) + " elements, " + std::to_string(run.mesh.unknowns) +
         std::string(" unknowns, minimum quality ") + general(run.mesh.min_quality) +
         ". Solver: " + std::to_string(run.solver.increments) + " increments, " +
         std::to_string(run.solver.newton_iterations) + " Newton iterations, " +
         std::to_string(run.solver.cutbacks) + " cut-backs, " + general(run.solver.seconds) +
         " s.\n";
  out += "\nCautions:\n";
  for (const std::string& caution : cautions_to_report(run)) {
    out += std::string("  - ") + caution + "\n";
  }
  return out;
}

void write_summary_text(const std::filesystem::path& path, const RunResults& run,
                        const OutputUnit& unit) {
  write_file_atomically(path, format_results_table(run, unit));
}

}  // namespace plystrain
