// `plystrain reference`: the case-format reference, generated from the key
// table (the source of docs/case-format-reference.md).
#include "commands.hpp"

#include "plystrain/solver/key_table.hpp"

#include <iostream>

namespace plystrain::cli {

Command add_reference_command(CLI::App& app) {
  CLI::App* reference = app.add_subcommand(
      "reference",
      "Print the case-format reference in Markdown (docs/case-format-reference.md is its output)");
  return {reference, [] {
            std::cout << render_case_format_reference();
            return exit_done;
          }};
}

}  // namespace plystrain::cli
