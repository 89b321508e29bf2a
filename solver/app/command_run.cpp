// `plystrain run CASE [--out DIR]`: solve the case and write its results.
#include "commands.hpp"

#include "plystrain/solver/case_reader.hpp"
#include "plystrain/solver/run_pipeline.hpp"

#include <iostream>
#include <memory>
#include <string>

namespace plystrain::cli {

Command add_run_command(CLI::App& app) {
  auto options = std::make_shared<SolveOptions>();
  auto verify = std::make_shared<bool>(false);
  CLI::App* command = app.add_subcommand(
      "run", "Solve a case: per-layer peak strain, concentration, margins and verdicts");
  add_solve_options(*command, *options);
  command->add_flag("--verify", *verify,
                    "Rerun with the mesh near the defects halved and the width doubled, and report "
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
