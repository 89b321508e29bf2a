// `plystrain compare CASE [--out DIR]`: run the case as written (into base/)
// and each [[variant]] (into <variant>/), then write the side-by-side
// comparison per layer. A case with a [sweep] is refused (the sweep runs
// with `plystrain run`).
#include "commands.hpp"

#include "interrupts.hpp"

#include "plystrain/solver/case_reader.hpp"
#include "plystrain/solver/case_variants.hpp"
#include "plystrain/solver/comparison.hpp"
#include "plystrain/solver/input_error.hpp"
#include "plystrain/solver/run_pipeline.hpp"

#include <iostream>
#include <memory>
#include <string>
#include <vector>

namespace plystrain::cli {

namespace {

// Runs the case as written and each variant, each into its folder under
// `out`; an interruption ends the comparison with the run it stopped, and
// the comparison holds the runs so far.
int compare_into(const CaseSpec& base, const std::vector<ResolvedCase>& variants,
                 const SolveOptions& options, const std::filesystem::path& out,
                 const std::filesystem::path& shown) {
  int code = exit_done;
  const auto run_one = [&](const CaseSpec& spec, const std::string& name) {
    std::cout << "== " << name << "\n" << std::flush;
    RunOptions run;
    run.out = out / name;
    run.threads = options.threads;
    run.stop_requested = stop_signal_name;
    run.progress = [](const std::string& line) { std::cout << "  " << line << "\n" << std::flush; };
    RunOutcome outcome = run_case(spec, run);
    std::cout << outcome.table << "\n";
    code = worse_exit(code, run_exit_code(outcome.results));
    return outcome.results;
  };
  const RunResults base_results = run_one(base, "base");
  std::vector<NamedRun> runs;
  for (std::size_t i = 0; i < variants.size() && code != exit_interrupted; ++i) {
    runs.push_back({variants[i].name, run_one(variants[i].spec, variants[i].name)});
  }
  const Comparison comparison = compare_runs(base_results, runs);
  write_comparison_files(out, comparison);
  std::cout << comparison_text(comparison);
  std::cout << "\nComparison in " << (shown / "comparison.txt").string()
            << " (also comparison.json, comparison.csv)\n";
  return code;
}

}  // namespace

Command add_compare_command(CLI::App& app) {
  auto options = std::make_shared<SolveOptions>();
  CLI::App* command = app.add_subcommand(
      "compare", "Run the case and each of its variants; compare the layers side by side");
  add_solve_options(*command, *options);
  return {command, [options] {
            const CaseSpec base = read_case(options->case_path);
            if (base.sweep) {
              // A sweep is run by `run`; comparing variants of a swept case
              // would leave the reader to guess which value the variants had.
              throw InputError(
                  base.sweep->where, "sweep",
                  "compare runs the case and its variants, not a sweep: run the sweep with "
                  "`plystrain run`, or remove the [sweep] table to compare the variants");
            }
            const std::vector<ResolvedCase> variants = resolve_variants(base);
            check_reruns_fit(base, false);
            if (variants.empty()) {
              throw InputError(SourceLocation{base.source.string(), 0, 0}, "variant",
                               "compare needs at least one [[variant]] in the case");
            }
            const OutputChoice output = output_choice(options->out, base);
            const InterruptHandlers interrupts;
            return run_into_output_folder(output, [&](const std::filesystem::path& out) {
              return compare_into(base, variants, *options, out, output.folder);
            });
          }};
}

}  // namespace plystrain::cli
