// The run pipeline of architecture.md: mesh the case, build the model of
// each solve, step the load with Newton, evaluate, and write the output
// directory (results-format.md). Each converged increment is written as it
// arrives, so a run that stops early keeps what it finished.
#pragma once

#include "plystrain/solver/case_spec.hpp"
#include "plystrain/solver/results.hpp"

#include <filesystem>
#include <functional>
#include <string>

namespace plystrain {

struct RunOptions {
  std::filesystem::path out;  // output directory (created)
  // One line per converged increment and per notable event, for the terminal.
  std::function<void(const std::string&)> progress;
  int threads = 0;  // OpenMP threads for assembly; 0 = the OpenMP default
  bool verify = false;  // as report.verify: rerun finer and wider, report how the peaks moved
  // Asked after every Newton iteration and increment: the name of what asks
  // the run to stop (e.g. "SIGINT"), or empty to go on. A stop keeps the last
  // converged increment, skips what is left (the undisturbed state, local
  // cells, the convergence check) and writes the results so far, with
  // completed = false and interrupted_by set to the name.
  std::function<std::string()> stop_requested;
};

struct RunOutcome {
  RunResults results;
  std::filesystem::path out;
  std::string table;  // the per-layer table (summary.txt)
};

// Throws InputError for a case that cannot be meshed or modelled; numerical
// trouble and a stop are reported in the outcome (results.completed == false).
[[nodiscard]] RunOutcome run_case(const CaseSpec& spec, const RunOptions& options);

// A short hash of the case as run (the text of case.toml), for stamping outputs.
[[nodiscard]] std::string case_hash(const std::string& case_text);

}  // namespace plystrain
