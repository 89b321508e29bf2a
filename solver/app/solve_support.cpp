// What the commands that solve a case share: their options, how a run goes
// into its output folder (output_folder.hpp), and its exit code.
#include "commands.hpp"

#include "plystrain/solver/atomic_file.hpp"
#include "plystrain/solver/case_limits.hpp"
#include "plystrain/solver/case_reader.hpp"
#include "plystrain/solver/case_variants.hpp"
#include "plystrain/solver/convergence_check.hpp"
#include "plystrain/solver/input_error.hpp"
#include "plystrain/solver/input_text.hpp"

#include <cmath>
#include <exception>
#include <string>
#include <utility>

namespace plystrain::cli {

namespace {

// Digits in groups of three, as the case checks print counts.
// The convergence check reruns the case on a mesh with half the sizes,
// about four times the cells: refused before anything is solved when that
// rerun would pass the mesh limit that check applies to the case itself.
void check_one_case_reruns_fit(const CaseSpec& spec, bool verify_flag) {
  if (!verify_flag && !spec.report.verify.value) {
    return;
  }
  for (const ConvergenceRerunPlan& plan : convergence_reruns(spec)) {
    const double cells = estimated_mesh_cells(plan.spec);
    if (cells <= limits::mesh_cells) {
      continue;
    }
    const bool by_key = !verify_flag && spec.report.verify.given;
    const SourceLocation where = by_key ? spec.report.verify.where : SourceLocation{spec.source.string(), 0, 0};
    throw InputError(where, by_key ? "report.verify" : "--verify",
                     "the convergence check would rerun the case with its " + plan.what + ", about " +
                         grouped_count(static_cast<std::size_t>(std::llround(cells))) +
                         " cells, more than the limit of " +
                         grouped_count(static_cast<std::size_t>(limits::mesh_cells)) +
                         "; larger mesh sizes or a narrower width leave room for it, or run without the check");
  }
}

}  // namespace

void check_reruns_fit(const CaseSpec& spec, bool verify_flag) {
  if (spec.sweep) {
    for (const ResolvedCase& value : resolve_sweep(spec)) {
      check_one_case_reruns_fit(value.spec, verify_flag);
    }
    return;
  }
  check_one_case_reruns_fit(spec, verify_flag);
  // compare runs every variant with the case's own report.verify.
  for (const ResolvedCase& variant : resolve_variants(spec)) {
    check_one_case_reruns_fit(variant.spec, verify_flag);
  }
}

void add_out_option(CLI::App& command, std::string& out) {
  command.add_option("--out", out, "Output directory (default: the case's report.out)")
      ->check(CLI::Validator(
          [](const std::string& value) {
            return value.empty() ? std::string("expected the name of an output folder, found \"\"")
                                 : std::string();
          },
          "FOLDER"));
}

void add_solve_options(CLI::App& command, SolveOptions& options) {
  command.add_option("CASE", options.case_path, "The case file (TOML)")->required();
  add_out_option(command, options.out);
  command.add_option("--threads", options.threads, "Threads for assembly (default: all cores)")
      ->check(CLI::NonNegativeNumber);
}

OutputChoice output_choice(const std::string& out_option, const CaseSpec& spec) {
  if (!out_option.empty()) {
    return {out_option, {SourceLocation{"command line", 0, 0}, "--out"}};
  }
  return {spec.report.out.value, {spec.report.out.where, "report.out"}};
}

int run_exit_code(const RunResults& results) {
  if (!results.interrupted_by.empty()) {
    return exit_interrupted;
  }
  return results.completed ? exit_done : exit_load_not_reached;
}

int worse_exit(int a, int b) {
  const auto rank = [](int code) {
    return code == exit_interrupted ? 2 : code == exit_load_not_reached ? 1 : 0;
  };
  return rank(a) >= rank(b) ? a : b;
}

int run_into_output_folder(const OutputChoice& output,
                           const std::function<int(const std::filesystem::path&)>& work) {
  StagedOutput staged(output.folder, output.source);
  int code = exit_done;
  try {
    code = work(staged.path());
  } catch (const InputError&) {
    throw;  // nothing was solved: the folder keeps what it held
  } catch (const OutputWriteError&) {
    // The disk refused a file: what was written is incomplete, and the
    // folder keeps what it held (the hidden folder goes, freeing its space).
    throw;
  } catch (...) {
    // A failed run keeps what it finished, as a run that stopped early does.
    try {
      staged.commit();
    } catch (const std::exception&) {
      // The error in flight says more; the files stay in the hidden folder.
    }
    throw;
  }
  staged.commit();
  return code;
}

}  // namespace plystrain::cli
