// End-to-end checks of the undisturbed reference state, of edges that add no
// disturbance of their own, and of the width a case chooses for itself.
#include "cli/cli_support.hpp"
#include "cli/results_support.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <string>

using plystrain::test::data_path;
using plystrain::test::has_caution;
using plystrain::test::read_text;
using plystrain::test::layer_named;
using plystrain::test::run_plystrain;

namespace {

struct Run {
  nlohmann::json results;
  std::string terminal;
};

Run run_file(const std::filesystem::path& case_file, const std::string& name) {
  const std::filesystem::path out = plystrain::test::fresh_output_dir(name);
  const auto result =
      run_plystrain("run '" + case_file.string() + "' --out '" + out.string() + "' --threads 1");
  INFO(result.out << "\n" << result.err);
  REQUIRE(result.exit_code == 0);
  Run run{nlohmann::json::parse(read_text(out / "results.json")), result.out};
  std::filesystem::remove_all(out);
  return run;
}

double plane_strain_modulus(double youngs_modulus, double poisson_ratio) {
  return youngs_modulus / (1.0 - poisson_ratio * poisson_ratio);
}

// A copy of a case from tests/data with lines added after [geometry] and
// after [mesh], written to a scratch folder with its material file named by
// absolute path.
std::filesystem::path case_with_lines(const std::string& case_file,
                                      const std::string& geometry_line,
                                      const std::string& mesh_lines, const std::string& name) {
  const std::filesystem::path original = data_path(case_file);
  std::string text = read_text(original);
  for (const auto& [header, line] :
       {std::pair<std::string, std::string>{"[geometry]\n", geometry_line},
        std::pair<std::string, std::string>{"[mesh]\n", mesh_lines}}) {
    REQUIRE(text.find(header) != std::string::npos);
    text.insert(text.find(header) + header.size(), line + "\n");
  }
  const std::string materials = "\"check-materials.toml\"";
  const std::size_t at = text.find(materials);
  REQUIRE(at != std::string::npos);
  text.replace(at, materials.size(),
               "\"" + (original.parent_path() / "check-materials.toml").string() + "\"");
  const std::filesystem::path folder = plystrain::test::fresh_output_dir(name + "-case");
  std::filesystem::create_directories(folder);
  const std::filesystem::path copy = folder / (name + ".toml");
  std::ofstream(copy) << text;
  return copy;
}

}  // namespace

TEST_CASE("defect-free bilayer bent on a wide strip: laminate strains up to the loaded edge",
          "[cli][reference][bend]") {
  // Case: base 10 um (E = 10 MPa, nu = 0.45) under a 1 um film (E = 100
  // MPa, nu = 0.3), plane strain, bent to R = 5 mm over a half-width of
  // 1 mm, so the loaded edge turns by 0.2 rad. Raw integration-point values
  // (averaging_radius = 0), fine layers through the thickness.
  //
  // Laminate plate theory (verification.md section 4; Timoshenko &
  // Goodier, Theory of Elasticity, 1970, pure bending): the neutral plane at
  // y_N = sum(Ebar_i t_i y_i) / sum(Ebar_i t_i); the strain along x at
  // height y is (y - y_N) / R; with sigma_zz = 0 and plane strain the
  // thickness strain is -nu/(1 - nu) times it (derived: eps_zz = -nu/(1 -
  // nu) eps_xx from sigma_zz = 0, eps_yy = 0). A strain about 7e-4 keeps
  // second-order terms far below the 0.5 % tolerance. The peak and minimum
  // are taken over the whole width, so an edge that disturbed the state
  // would show in them.
  const Run run = run_file(data_path("cli/bend-bilayer-wide.toml"), "bend-wide");
  const nlohmann::json& results = run.results;
  REQUIRE(results["completed"] == true);
  const double radius = 5000.0;
  const double base_top = 10.0;
  const double top = 11.0;
  const double e_base = plane_strain_modulus(10.0, 0.45);
  const double e_film = plane_strain_modulus(100.0, 0.3);
  const double neutral = (e_base * base_top * base_top / 2.0 + e_film * 1.0 * (base_top + 0.5)) /
                         (e_base * base_top + e_film);
  const auto along = [&](double y) { return (y - neutral) / radius; };
  const auto thickness_strain = [&](double y, double nu) { return -nu / (1.0 - nu) * along(y); };

  const nlohmann::json& film = layer_named(results, "film");
  const nlohmann::json& base = layer_named(results, "base");
  // The film is in tension through its thickness: its peak is the top
  // fibre, its minimum the thickness strain there.
  const double film_peak_z = film["peak_at"][1].get<double>();
  INFO("neutral plane " << neutral << "; film peak " << film["peak_strain"]
                        << " at z = " << film_peak_z << ", x = " << film["peak_at"][0]);
  CHECK(film["peak_strain"].get<double>() == Approx(along(film_peak_z)).epsilon(5e-3));
  CHECK(film_peak_z > top - 1.0 / 16.0);  // within the top cell
  CHECK(film["min_strain"].get<double>() == Approx(thickness_strain(top, 0.3)).epsilon(2e-2));
  // The base: compressed along x at its bottom, where its thickness swells
  // by nu/(1 - nu) = 0.82 times that, more than its top (at 2.4 um above the
  // neutral plane) stretches: its largest principal strain is that swelling
  // at the bottom, its most compressive the bottom fibre.
  const double base_peak_z = base["peak_at"][1].get<double>();
  CHECK(base["peak_strain"].get<double>() ==
        Approx(thickness_strain(base_peak_z, 0.45)).epsilon(5e-3));
  CHECK(base_peak_z < 10.0 / 40.0);  // within the bottom cell
  CHECK(base["min_strain"].get<double>() == Approx(along(0.0)).epsilon(5e-3));
  // Edges included: the strain at the loaded edge is the laminate's, and
  // the undisturbed state (the same laminate on a narrow cell) gives a
  // concentration of 1.
  for (const nlohmann::json* layer : {&film, &base}) {
    INFO("layer " << (*layer)["name"]);
    CHECK((*layer)["strain_at_cell_edge"].get<double>() ==
          Approx((*layer)["peak_strain"].get<double>()).epsilon(5e-3));
    CHECK((*layer)["concentration"].get<double>() == Approx(1.0).epsilon(5e-3));
  }
}

TEST_CASE("defect-free stack under stretch: concentration exactly 1", "[cli][reference][stretch]") {
  // A uniform stretch of a bonded laminate is a homogeneous state in every
  // layer, reproduced exactly by any element (patch test, common practice):
  // the peak, the undisturbed strain and the strain at the cell edge are the
  // applied 5 % to rounding, in every layer.
  const Run run = run_file(data_path("cli/stretch-stack-uniform.toml"), "uniform-stack");
  REQUIRE(run.results["completed"] == true);
  REQUIRE(run.results["cell"]["width_basis"] == "isolating");
  for (const nlohmann::json& layer : run.results["layers"]) {
    INFO("layer " << layer["name"]);
    CHECK(layer["peak_strain"].get<double>() == Approx(0.05).epsilon(1e-9));
    CHECK(layer["far_field_strain"].get<double>() == Approx(0.05).epsilon(1e-9));
    CHECK(layer["concentration"].get<double>() == Approx(1.0).epsilon(1e-9));
    CHECK(layer["strain_at_cell_edge"].get<double>() == Approx(0.05).epsilon(1e-9));
  }
}

TEST_CASE("a slit in a film on a soft base: the chosen width isolates it",
          "[cli][reference][width]") {
  // The width the case chooses (no width given) against twice that width:
  // every layer's peak within 2 %, the undisturbed strain the applied one,
  // and the defect's disturbance gone at the cell edge. A width well inside
  // the zone of influence is a row of slits, and the run must say so.
  const Run chosen = run_file(data_path("cli/slit-film-soft.toml"), "slit-chosen");
  const nlohmann::json& cell = chosen.results["cell"];
  REQUIRE(cell["width_basis"] == "isolating");
  const double width = cell["width"].get<double>();
  REQUIRE(chosen.results["defects"].size() == 1);
  CHECK(chosen.results["defects"][0]["kind"] == "slit");
  CHECK(chosen.results["defects"][0]["covered"] == true);
  CHECK(cell["edge_disturbance"].get<double>() < 0.02);
  CHECK_FALSE(has_caution(chosen.results, "row of"));

  // The same mesh sizes: only the width changes (the chosen width's far
  // size is width / 40, its grading length ten times that).
  const std::string same_mesh = "size_far = " + std::to_string(width / 40.0) +
                                "\ngrade_over = " + std::to_string(width / 4.0);
  const Run doubled =
      run_file(case_with_lines("cli/slit-film-soft.toml", "width = " + std::to_string(2.0 * width),
                               same_mesh, "slit-doubled"),
               "slit-doubled");
  for (const char* name : {"base", "film"}) {
    INFO("layer " << name << ": chosen width " << width);
    const double a = layer_named(chosen.results, name)["peak_strain"].get<double>();
    const double b = layer_named(doubled.results, name)["peak_strain"].get<double>();
    CHECK(a == Approx(b).epsilon(0.02));
    CHECK(layer_named(chosen.results, name)["far_field_strain"].get<double>() ==
          Approx(0.01).epsilon(2e-3));
  }

  const Run narrow =
      run_file(case_with_lines("cli/slit-film-soft.toml", "width = " + std::to_string(width / 8.0),
                               "", "slit-narrow"),
               "slit-narrow");
  CHECK(narrow.results["cell"]["width_basis"] == "given");
  CHECK(narrow.results["defects"][0]["covered"] == false);
  CHECK(has_caution(narrow.results, "row of such defects"));
  // Measured as well: the film at the narrow cell's edge is still short of
  // the applied strain.
  CHECK(narrow.results["cell"]["edge_disturbance"].get<double>() > 0.02);
}

TEST_CASE("the convergence check reruns a case finer and wider and reports how far each peak moved",
          "[cli][reference][verify]") {
  // A uniform laminate state is reproduced exactly by any mesh and any width
  // (patch test, common practice), so both reruns must give the same peaks
  // to rounding and the verdict must say so.
  const std::filesystem::path out = plystrain::test::fresh_output_dir("verify-uniform");
  const auto result = run_plystrain("run '" + data_path("cli/stretch-stack-uniform.toml") + "' --out '" +
                                    out.string() + "' --threads 1 --verify");
  INFO(result.out << "\n" << result.err);
  REQUIRE(result.exit_code == 0);
  const nlohmann::json results = nlohmann::json::parse(read_text(out / "results.json"));
  const nlohmann::json& verification = results["verification"];
  REQUIRE(verification.is_object());
  CHECK(verification["converged"] == true);
  CHECK(verification["verdict"].get<std::string>().find("converged within 2 %") == 0);
  REQUIRE(verification["reruns"].size() == 2);
  for (const nlohmann::json& rerun : verification["reruns"]) {
    INFO("rerun " << rerun["what"]);
    CHECK(std::filesystem::exists(out / rerun["folder"].get<std::string>() / "results.json"));
    CHECK(rerun["layers"].size() == 3);
    CHECK(rerun["largest_change"].get<double>() < 1e-9);
  }
  CHECK(result.out.find("Convergence check: converged within 2 %") != std::string::npos);
  std::filesystem::remove_all(out);
}
