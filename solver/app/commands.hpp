// The commands of the plystrain front end. Each registers its options on the
// CLI11 app and returns the exit code when run.
#pragma once

#include <CLI/CLI.hpp>

#include <functional>
#include <iosfwd>
#include <string>

namespace plystrain::cli {

// Exit codes (documented in the README).
inline constexpr int exit_done = 0;
inline constexpr int exit_internal_error = 1;
inline constexpr int exit_bad_input = 2;
inline constexpr int exit_load_not_reached = 3;

// A subcommand and what to run when it is chosen. The options are bound to
// storage that the action owns (shared with the parser).
struct Command {
  CLI::App* subcommand = nullptr;
  std::function<int()> action;
};

// The options shared by the commands that solve a case.
struct SolveOptions {
  std::string case_path;
  std::string out;  // empty: the case's report.out
  int threads = 0;  // 0: the OpenMP default
};

// Inside a catch block: prints the error in flight and returns its exit code
// (bad input 2, anything else 1).
int report_exception();

// Adds CASE, --out and --threads to `command`, bound to `options`.
void add_solve_options(CLI::App& command, SolveOptions& options);

Command add_check_command(CLI::App& app);
Command add_materials_command(CLI::App& app);
Command add_reference_command(CLI::App& app);
Command add_mesh_command(CLI::App& app);
Command add_run_command(CLI::App& app);
Command add_compare_command(CLI::App& app);

}  // namespace plystrain::cli
