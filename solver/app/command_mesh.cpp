// `plystrain mesh CASE [--out DIR]`: mesh the case's cross-section, write
// mesh.msh (Gmsh) and mesh.vtu (VTK), print counts and quality per layer.
#include "commands.hpp"

#include "plystrain/mesh/gmsh_session.hpp"
#include "plystrain/mesh/mesh_error.hpp"
#include "plystrain/mesh/msh_writer.hpp"
#include "plystrain/mesh/quality.hpp"
#include "plystrain/mesh/stack_mesher.hpp"
#include "plystrain/solver/atomic_file.hpp"
#include "plystrain/solver/case_reader.hpp"
#include "plystrain/solver/mesh_vtu_writer.hpp"
#include "plystrain/solver/stack_from_case.hpp"

#include <cstdio>
#include <filesystem>
#include <iostream>
#include <map>
#include <memory>
#include <string>

namespace plystrain::cli {

namespace {

std::string cell_summary(const mesh::Mesh& grid) {
  std::map<mesh::CellType, int> counts;
  for (const mesh::Cell& cell : grid.cells) {
    ++counts[cell.type];
  }
  std::string text;
  for (const auto& [type, count] : counts) {
    text += (text.empty() ? "" : ", ") + std::to_string(count) + " " +
            mesh::cell_type_name(type) + (count == 1 ? "" : "s");
  }
  return text;
}

std::string quality_table(const mesh::MeshQuality& quality) {
  std::string text = "  layer                 cells   min scaled Jacobian   max aspect ratio\n";
  for (const mesh::LayerQuality& layer : quality.layers) {
    char line[160];
    std::snprintf(line, sizeof line, "  %-20s %7d   %19.3f   %16.1f\n", layer.layer.c_str(),
                  layer.cells, layer.min_scaled_jacobian, layer.max_aspect_ratio);
    text += line;
  }
  return text;
}

}  // namespace

Command add_mesh_command(CLI::App& app) {
  struct Options {
    std::string case_path;
    std::string out;
  };
  auto options = std::make_shared<Options>();
  CLI::App* command = app.add_subcommand(
      "mesh", "Mesh the case's cross-section; write mesh.msh and mesh.vtu and print quality");
  command->add_option("CASE", options->case_path, "The case file (TOML)")->required();
  add_out_option(*command, options->out);
  return {command, [options] {
            const CaseSpec spec = read_case(options->case_path);
            const OutputChoice output = output_choice(options->out, spec);
            const std::filesystem::path& out = output.folder;

            mesh::GmshSession session;
            mesh::Mesh grid;
            mesh::MeshQuality quality;
            try {
              grid = mesh::build_stack_mesh(session, stack_from_case(spec));
              quality = mesh::measure_quality(grid);
            } catch (const mesh::MeshError& error) {
              throw input_error_from_mesh_error(error, spec);
            }

            prepare_output_folder(out, output.source);
            write_path_atomically(out / "mesh.msh", [&](const std::filesystem::path& temporary) {
              try {
                mesh::write_msh(session, temporary);
              } catch (const mesh::MeshError& error) {
                throw OutputWriteError(out / "mesh.msh", error.what());
              }
              return true;
            });
            solver::write_mesh_vtu(grid, out / "mesh.vtu");

            std::cout << spec.title.value << "\n";
            std::cout << "  " << grid.node_count() << " nodes, " << grid.cell_count()
                      << " cells (" << cell_summary(grid) << ")\n\n";
            std::cout << quality_table(quality);
            std::cout << "\nWrote " << (out / "mesh.msh").string() << " and "
                      << (out / "mesh.vtu").string() << "\n";
            return exit_done;
          }};
}

}  // namespace plystrain::cli
