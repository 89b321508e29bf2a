// Side-by-side comparison of a base run and its variants (or swept values):
// comparison.json, comparison.csv and comparison.txt of results-format.md.
//
// Per layer, the best run is the one with the widest crack margin among the
// runs that completed and have the layer; equal crack margins (to 1e-9
// relative) are decided by the wider yield margin, and only then by the
// lower peak strain. A run with a margin beats one without (no limit data
// cannot be judged better); when no run has limit data the lowest peak
// decides. Runs still equal are all marked best. Figures are the governing
// ones of each run (global and local checks, see governing_layers). A layer
// a run does not have is absent, not zero.
//
// A sweep is compared the same way, one run per value, into sweep.csv and
// sweep.json.
#pragma once

#include "plystrain/solver/results.hpp"

#include <filesystem>
#include <optional>
#include <string>
#include <vector>

namespace plystrain {

struct NamedRun {
  std::string name;  // "base", a variant name, or "sweep-<n>"
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
  std::optional<double> yield_margin;
  std::optional<double> crack_onset_load_factor;
  std::optional<double> yield_load_factor;
};

struct RunOutline {
  std::string name;
  bool completed = false;
  double load_reached = 0.0;
  std::string message;
  std::string value;  // a sweep run's value as written in the case ("0.1"); set by the caller
  std::string headline;
  Verdict verdict = Verdict::unknown;  // overall verdict of the run
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
// The runs as given, in order (a sweep: one per value; the caller fills in
// each RunOutline::value).
[[nodiscard]] Comparison compare_runs(const std::vector<NamedRun>& runs);

[[nodiscard]] std::string comparison_json_text(const Comparison& comparison);
// Header: variant,layer,peak_strain,concentration,crack_margin,verdict,best,completed,
// yield_margin,crack_onset_load_factor,yield_load_factor (the last three
// added after the original columns, so that readers by position keep
// working). An absent layer has empty numbers and the verdict "absent".
[[nodiscard]] std::string comparison_csv_text(const Comparison& comparison);
[[nodiscard]] std::string comparison_text(const Comparison& comparison);

// Writes comparison.json, comparison.csv and comparison.txt into `directory`.
void write_comparison_files(const std::filesystem::path& directory, const Comparison& comparison);

// The combined table of a sweep over `parameter`: per value and layer the
// peak, concentration, both margins, verdict and first-crack and
// first-yield load factors. sweep.csv header: run,parameter,value,layer,
// peak_strain,concentration,crack_margin,yield_margin,verdict,
// crack_onset_load_factor,yield_load_factor,best,completed.
[[nodiscard]] std::string sweep_csv_text(const Comparison& sweep, const std::string& parameter);
[[nodiscard]] std::string sweep_json_text(const Comparison& sweep, const std::string& parameter);
// Writes sweep.json, sweep.csv and sweep.txt (comparison_text) into `directory`.
void write_sweep_files(const std::filesystem::path& directory, const Comparison& sweep,
                       const std::string& parameter);

}  // namespace plystrain
