// plystrain command line front end: parses the command, runs it, and maps
// errors to the documented exit codes.
#include "commands.hpp"

#include "plystrain/solver/atomic_file.hpp"
#include "plystrain/solver/input_error.hpp"

#include <exception>
#include <iostream>
#include <new>
#include <string>
#include <vector>

namespace plystrain::cli {

namespace {

int internal_error(const std::string& what) {
  std::cerr << "plystrain: internal error: " << what
            << "\nPlease report this together with the case file.\n";
  return exit_internal_error;
}

}  // namespace

int report_exception() {
  // Whatever a command or a library throws ends here as a message and an
  // exit code, never as an abort; libraries that throw something other than
  // std::exception (Gmsh throws std::string) included.
  try {
    throw;
  } catch (const InputError& error) {
    std::cerr << error.what() << "\n";
    return exit_bad_input;
  } catch (const OutputWriteError& error) {
    std::cerr << "plystrain: " << error.what()
              << "\nNo file was left half-written, and an output folder keeps the run it held "
                 "before; free some space (or raise the file-size limit) and run again, or write "
                 "elsewhere with --out.\n";
    return exit_internal_error;
  } catch (const std::bad_alloc&) {
    std::cerr << "plystrain: out of memory: the model does not fit into this machine's memory; "
                 "coarser mesh sizes (mesh.size_near, mesh.size_far) or a narrower width need "
                 "less\n";
    return exit_internal_error;
  } catch (const std::exception& error) {
    return internal_error(error.what());
  } catch (const std::string& message) {
    return internal_error(message);
  } catch (const char* message) {
    return internal_error(message);
  } catch (...) {
    return internal_error("an exception of unknown type");
  }
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
  } catch (...) {
    return report_exception();
  }
}
