// `plystrain run CASE [--out DIR]`: solve the case and write its results. A
// case with a [sweep] runs once per swept value, each into <out>/sweep-<n>,
// and writes the combined table (sweep.csv, sweep.json, sweep.txt) into <out>.
#include "commands.hpp"

#include "interrupts.hpp"
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

// Runs every value of the sweep in turn; an interruption ends the sweep
// after the value it stopped, and the table holds the values run so far.
int run_sweep(const CaseSpec& base, const RunOptions& options, const std::filesystem::path& shown) {
  const std::vector<ResolvedCase> values = resolve_sweep(base);
  const std::string& parameter = base.sweep->parameter.value;
  std::vector<NamedRun> runs;
  int code = exit_done;
  for (std::size_t i = 0; i < values.size() && code != exit_interrupted; ++i) {
    const std::string value = case_value_text(base.sweep->values[i].value);
    std::cout << "== sweep value " << i + 1 << " of " << values.size() << ": " << parameter << " = "
              << value << " (" << values[i].name << "/)\n"
              << std::flush;
    RunOptions run = options;
    run.out = options.out / values[i].name;
    run.progress = [](const std::string& line) { std::cout << "  " << line << "\n" << std::flush; };
    RunOutcome outcome = run_case(values[i].spec, run);
    std::cout << outcome.table << "\n";
    code = worse_exit(code, run_exit_code(outcome.results));
    runs.push_back({values[i].name, std::move(outcome.results)});
  }
  Comparison sweep = compare_runs(runs);
  for (std::size_t i = 0; i < sweep.runs.size(); ++i) {
    sweep.runs[i].value = case_value_text(base.sweep->values[i].value);
  }
  write_sweep_files(options.out, sweep, parameter);
  std::cout << comparison_text(sweep);
  std::cout << "\nSweep of " << parameter << " in " << (shown / "sweep.txt").string()
            << " (also sweep.csv, sweep.json; one folder per value)\n";
  return code;
}

int run_one(const CaseSpec& spec, const RunOptions& options, const std::filesystem::path& shown) {
  const RunOutcome outcome = run_case(spec, options);
  std::cout << "\n" << outcome.table;
  std::cout << "\nResults in " << shown.string() << " (results.json, summary.txt";
  if (spec.report.fields.value) {
    std::cout << "; open fields.pvd in ParaView";
  }
  std::cout << ")\n";
  return run_exit_code(outcome.results);
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
            check_reruns_fit(spec, *verify);
            const OutputChoice output = output_choice(options->out, spec);
            const InterruptHandlers interrupts;
            return run_into_output_folder(output, [&](const std::filesystem::path& out) {
              std::cout << spec.title.value << "\n";
              RunOptions run;
              run.out = out;
              run.threads = options->threads;
              run.verify = *verify;
              run.stop_requested = stop_signal_name;
              run.progress = [](const std::string& line) {
                std::cout << line << "\n" << std::flush;
              };
              return spec.sweep ? run_sweep(spec, run, output.folder)
                                : run_one(spec, run, output.folder);
            });
          }};
}

}  // namespace plystrain::cli
