// The commands of the plystrain front end. Each registers its options on the
// CLI11 app and returns the exit code when run.
#pragma once

#include "plystrain/solver/case_spec.hpp"
#include "plystrain/solver/output_folder.hpp"
#include "plystrain/solver/results.hpp"

#include <CLI/CLI.hpp>

#include <filesystem>
#include <functional>
#include <iosfwd>
#include <string>

namespace plystrain::cli {

// Exit codes (documented in the README).
inline constexpr int exit_done = 0;
inline constexpr int exit_internal_error = 1;
inline constexpr int exit_bad_input = 2;
inline constexpr int exit_load_not_reached = 3;
inline constexpr int exit_interrupted = 4;  // SIGINT or SIGTERM; the converged part is kept

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
// Adds --out (a folder name; empty is refused) bound to `out`.
void add_out_option(CLI::App& command, std::string& out);

// The output folder of a command and where it was named.
struct OutputChoice {
  std::filesystem::path folder;
  FolderSource source;
};
// --out when given, else the case's report.out.
[[nodiscard]] OutputChoice output_choice(const std::string& out_option, const CaseSpec& spec);

// The exit code of a run: interrupted, the full load not reached, or done.
[[nodiscard]] int run_exit_code(const RunResults& results);
// Of two exit codes of runs, the one to report (interrupted before not
// reached before done).
[[nodiscard]] int worse_exit(int a, int b);

// Runs `work`, which writes into the folder it is given, and puts what it
// wrote in place of the output folder when it returns or fails (bad input
// excepted: the folder then keeps what it held). Returns `work`'s exit code.
int run_into_output_folder(const OutputChoice& output,
                           const std::function<int(const std::filesystem::path&)>& work);

// Refuses (InputError naming report.verify or --verify) a case, one of its
// sweep values or one of its variants whose convergence check would rerun it
// on a mesh past the mesh limit: the check halves both mesh sizes, about
// four times the cells.
void check_reruns_fit(const CaseSpec& spec, bool verify_flag);

Command add_check_command(CLI::App& app);
Command add_materials_command(CLI::App& app);
Command add_reference_command(CLI::App& app);
Command add_mesh_command(CLI::App& app);
Command add_run_command(CLI::App& app);
Command add_compare_command(CLI::App& app);

}  // namespace plystrain::cli
