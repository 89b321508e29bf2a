// plystrain command line front end: parses the command, runs it, and maps
// errors to the documented exit codes.
#include "commands.hpp"

#include "plystrain/solver/input_error.hpp"

#include <exception>
#include <iostream>
#include <string>
#include <vector>

namespace plystrain::cli {

void add_solve_options(CLI::App& command, SolveOptions& options) {
  command.add_option("CASE", options.case_path, "The case file (TOML)")->required();
  command.add_option("--out", options.out, "Output directory (default: the case's report.out)");
  command.add_option("--threads", options.threads, "Threads for assembly (default: all cores)")
      ->check(CLI::NonNegativeNumber);
}

}  // namespace plystrain::cli

int main(int argc, char** argv) {
  using namespace plystrain::cli;
  CLI::App app{
      "plystrain: strain in flexible and stretchable thin-film device stacks.\n"
      "Reads a TOML case (stack, defects, deformation), meshes and solves the\n"
      "cross-section, and reports per-layer peak strain and margins.\n"
      "Results are model estimates; they defer to physical testing, the\n"
      "applicable standards and qualified review.",
      "plystrain"};
  app.set_version_flag("--version", std::string("plystrain ") + PLYSTRAIN_VERSION);
  app.require_subcommand(1);

  const std::vector<Command> commands = {
      add_check_command(app),
      add_materials_command(app),
      add_reference_command(app),
      add_mesh_command(app),
      add_run_command(app),
      add_compare_command(app),
  };

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& error) {
    const int code = app.exit(error);
    return code == 0 ? exit_done : exit_bad_input;
  }

  try {
    for (const Command& command : commands) {
      if (command.subcommand->parsed()) {
        return command.action();
      }
    }
    std::cerr << "plystrain: no command given (see plystrain --help)\n";
    return exit_bad_input;
  } catch (const plystrain::InputError& error) {
    std::cerr << error.what() << "\n";
    return exit_bad_input;
  } catch (const std::exception& error) {
    std::cerr << "plystrain: internal error: " << error.what()
              << "\nPlease report this together with the case file.\n";
    return exit_internal_error;
  }
}
