// Side-by-side comparison of a base run and its variants (or swept values):
// comparison.json, comparison.csv and comparison.txt of results-format.md.
//
// Per layer, the best run is the one with the lowest peak strain among the
// runs that completed and have the layer; equal peaks (to 1e-9 relative) are
// decided by the larger crack margin, and runs still equal are all marked
// best. Figures are the governing ones of each run (global and local checks,
// see governing_layers). A layer a run does not have is absent, not zero.
#pragma once

#include "plystrain/solver/results.hpp"

#include <filesystem>
#include <optional>
#include <string>
#include <vector>

namespace plystrain {

struct NamedRun {
  std::string name;  // "base", a variant name, or "<parameter>=<value>"
  RunResults results;
};

struct ComparisonEntry {
  std::string run;
  std::string layer;
  bool present = false;    // false: the run has no such layer
  bool completed = false;  // whether the run reached its full load
  std::optional<double> peak_strain;
  std::optional<double> concentration;
  std::optional<double> crack_margin;
  std::optional<Verdict> verdict;
  bool best = false;
};

struct RunOutline {
  std::string name;
  bool completed = false;
  double load_reached = 0.0;
  std::string message;
};

struct Comparison {
  std::vector<RunOutline> runs;          // base first, then the variants in order
  std::vector<std::string> layers;       // base layers in order, then layers only variants have
  std::vector<ComparisonEntry> entries;  // per run, per layer (runs outer)

  [[nodiscard]] const ComparisonEntry& entry(const std::string& run,
                                             const std::string& layer) const;
};

// `base` is named "base". Throws std::invalid_argument when two runs share a
// name.
[[nodiscard]] Comparison compare_runs(const RunResults& base,
                                      const std::vector<NamedRun>& variants);

[[nodiscard]] std::string comparison_json_text(const Comparison& comparison);
// Header: variant,layer,peak_strain,concentration,crack_margin,verdict,best,completed.
// An absent layer has empty numbers and the verdict "absent".
[[nodiscard]] std::string comparison_csv_text(const Comparison& comparison);
[[nodiscard]] std::string comparison_text(const Comparison& comparison);

// Writes comparison.json, comparison.csv and comparison.txt into `directory`.
void write_comparison_files(const std::filesystem::path& directory, const Comparison& comparison);

}  // namespace plystrain
