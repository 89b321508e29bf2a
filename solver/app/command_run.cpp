// `plystrain run CASE [--out DIR]`: solve the case and write its results. A
// case with a [sweep] runs once per swept value, each into <out>/sweep-<n>,
// and writes the combined table (sweep.csv, sweep.json, sweep.txt) into <out>.
#include "commands.hpp"

#include "plystrain/solver/case_reader.hpp"
#include "plystrain/solver/case_variants.hpp"
#include "plystrain/solver/comparison.hpp"
#include "plystrain/solver/run_pipeline.hpp"

#include <iostream>
#include <memory>
#include <string>
#include <vector>

namespace plystrain::cli {

namespace {

int run_sweep(const CaseSpec& base, const std::filesystem::path& out, int threads) {
  const std::vector<ResolvedCase> values = resolve_sweep(base);
  const std::string& parameter = base.sweep->parameter.value;
  std::vector<NamedRun> runs;
  bool all_completed = true;
  for (std::size_t i = 0; i < values.size(); ++i) {
    const std::string value = case_value_text(base.sweep->values[i].value);
    std::cout << "== sweep value " << i + 1 << " of " << values.size() << ": " << parameter << " = "
              << value << " (" << values[i].name << "/)\n"
              << std::flush;
    RunOptions run;
    run.out = out / values[i].name;
    run.threads = threads;
    run.progress = [](const std::string& line) { std::cout << "  " << line << "\n" << std::flush; };
    RunOutcome outcome = run_case(values[i].spec, run);
    std::cout << outcome.table << "\n";
    all_completed = all_completed && outcome.results.completed;
    runs.push_back({values[i].name, std::move(outcome.results)});
  }
  Comparison sweep = compare_runs(runs);
  for (std::size_t i = 0; i < values.size(); ++i) {
    sweep.runs[i].value = case_value_text(base.sweep->values[i].value);
  }
  write_sweep_files(out, sweep, parameter);
  std::cout << comparison_text(sweep);
  std::cout << "\nSweep of " << parameter << " in " << (out / "sweep.txt").string()
            << " (also sweep.csv, sweep.json; one folder per value)\n";
  return all_completed ? exit_done : exit_load_not_reached;
}

}  // namespace

Command add_run_command(CLI::App& app) {
  auto options = std::make_shared<SolveOptions>();
  auto verify = std::make_shared<bool>(false);
  CLI::App* command = app.add_subcommand(
      "run",
      "Solve a case: per-layer peak strain, concentration, margins and verdicts (every value of "
      "a [sweep])");
  add_solve_options(*command, *options);
  command->add_flag("--verify", *verify,
                    "Rerun with the mesh halved and the width doubled, and report "
                    "how far each peak moved (as report.verify in the case)");
  return {command, [options, verify] {
            const CaseSpec spec = read_case(options->case_path);
            RunOptions run;
            run.out = options->out.empty() ? spec.report.out.value
                                           : std::filesystem::path(options->out);
            run.threads = options->threads;
            run.verify = *verify;
            run.progress = [](const std::string& line) { std::cout << line << "\n" << std::flush; };
            std::cout << spec.title.value << "\n";
            if (spec.sweep) {
              return run_sweep(spec, run.out, run.threads);
            }
            const RunOutcome outcome = run_case(spec, run);
            std::cout << "\n" << outcome.table;
            std::cout << "\nResults in " << outcome.out.string() << " (results.json, summary.txt";
            if (spec.report.fields.value) {
              std::cout << "; open fields.pvd in ParaView";
            }
            std::cout << ")\n";
            return outcome.results.completed ? exit_done : exit_load_not_reached;
          }};
}

}  // namespace plystrain::cli
