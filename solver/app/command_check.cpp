// `plystrain check CASE`: read and validate a case, print its summary.
#include "commands.hpp"

#include "plystrain/solver/case_reader.hpp"
#include "plystrain/solver/case_summary.hpp"

#include <iostream>
#include <memory>
#include <string>

namespace plystrain::cli {

Command add_check_command(CLI::App& app) {
  auto case_path = std::make_shared<std::string>();
  CLI::App* check = app.add_subcommand(
      "check", "Validate a case file and print a summary of its stack, defects and load");
  check->add_option("CASE", *case_path, "The case file (TOML)")->required();
  return {check, [case_path] {
            const CaseSpec spec = read_case(*case_path);
            check_reruns_fit(spec, false);
            std::cout << format_case_summary(spec);
            std::cout << "\nThe case is valid.\n";
            return exit_done;
          }};
}

}  // namespace plystrain::cli
