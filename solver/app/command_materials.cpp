// `plystrain materials [KEY]`: the material library, or one entry in full.
#include "commands.hpp"

#include "plystrain/solver/input_error.hpp"
#include "plystrain/solver/material_library.hpp"

#include <iostream>
#include <memory>
#include <string>
#include <vector>

namespace plystrain::cli {

Command add_materials_command(CLI::App& app) {
  struct Options {
    std::string key;
    std::vector<std::string> files;
  };
  auto options = std::make_shared<Options>();
  CLI::App* materials = app.add_subcommand(
      "materials", "List the material library, or show one material with its source");
  materials->add_option("KEY", options->key, "A material key: show this entry in full");
  materials->add_option("--file", options->files,
                        "Extra material files merged over the built-in library (in order)");
  return {materials, [options] {
            std::vector<std::filesystem::path> files(options->files.begin(), options->files.end());
            const MaterialLibrary library = load_material_library(files);
            if (options->key.empty()) {
              std::cout << format_material_table(library);
              return exit_done;
            }
            const materials::MaterialRecord* record = library.find(options->key);
            if (record == nullptr) {
              const std::string hint = library.closest_key(options->key);
              throw InputError(SourceLocation{"command line", 0, 0}, "materials KEY",
                               "no material \"" + options->key + "\" in the library" +
                                   (hint.empty() ? std::string{}
                                                 : "; did you mean \"" + hint + "\"?") +
                                   " (plystrain materials lists them all)");
            }
            std::cout << format_material_detail(*record);
            return exit_done;
          }};
}

}  // namespace plystrain::cli
