// `plystrain compare CASE [--out DIR]`: run the case as written (into base/)
// and each [[variant]] (into <variant>/), then write the side-by-side
// comparison per layer. A case with a [sweep] is refused (the sweep runs
// with `plystrain run`).
#include "commands.hpp"

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
            if (variants.empty()) {
              throw InputError(SourceLocation{base.source.string(), 0, 0}, "variant",
                               "compare needs at least one [[variant]] in the case");
            }
            const std::filesystem::path out =
                options->out.empty() ? base.report.out.value : std::filesystem::path(options->out);

            const auto run_one = [&](const CaseSpec& spec, const std::string& name) {
              std::cout << "== " << name << "\n" << std::flush;
              RunOptions run;
              run.out = out / name;
              run.threads = options->threads;
              run.progress = [](const std::string& line) {
                std::cout << "  " << line << "\n" << std::flush;
              };
              RunOutcome outcome = run_case(spec, run);
              std::cout << outcome.table << "\n";
              return outcome.results;
            };

            const RunResults base_results = run_one(base, "base");
            std::vector<NamedRun> runs;
            bool all_completed = base_results.completed;
            for (const ResolvedCase& variant : variants) {
              runs.push_back({variant.name, run_one(variant.spec, variant.name)});
              all_completed = all_completed && runs.back().results.completed;
            }
            const Comparison comparison = compare_runs(base_results, runs);
            write_comparison_files(out, comparison);
            std::cout << comparison_text(comparison);
            std::cout << "\nComparison in " << (out / "comparison.txt").string()
                      << " (also comparison.json, comparison.csv)\n";
            return all_completed ? exit_done : exit_load_not_reached;
          }};
}

}  // namespace plystrain::cli
