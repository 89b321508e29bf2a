// End-to-end runs of small cases through `plystrain run`, checked against
// closed forms outside the project.
#include "cli/cli_support.hpp"

#include "plystrain/materials/law.hpp"
#include "plystrain/solver/material_library.hpp"

#include <Eigen/LU>
#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <functional>

using plystrain::test::data_path;
using plystrain::test::run_plystrain;

namespace {

nlohmann::json run_case(const std::string& case_file, const std::string& name) {
  const std::filesystem::path out = plystrain::test::fresh_output_dir(name);
  const auto result =
      run_plystrain("run '" + data_path(case_file) + "' --out '" + out.string() + "'");
  INFO(result.out << "\n" << result.err);
  REQUIRE(result.exit_code == 0);
  for (const char* file :
       {"results.json", "summary.txt", "profiles.csv", "fields.pvd", "log.txt", "case.toml"}) {
    CHECK(std::filesystem::exists(out / file));
  }
  nlohmann::json json = nlohmann::json::parse(plystrain::test::read_text(out / "results.json"));
  std::filesystem::remove_all(out);
  return json;
}

// The free stretch of a homogeneous state: solves P_22(F) = 0 for the
// through-thickness stretch (and P_33 = 0 when `third_free`), by Newton on a
// central-difference slope. An independent pointwise solution of the same law.
Eigen::Matrix3d homogeneous_state(const plystrain::materials::LawParameters& law, double stretch,
                                  double third, bool third_free) {
  Eigen::Matrix3d F = Eigen::Matrix3d::Identity();
  F(0, 0) = stretch;
  F(2, 2) = third;
  const auto lateral = [&](const Eigen::Matrix3d& G) {
    const plystrain::materials::PointResponse r = plystrain::materials::evaluate(law, G);
    return Eigen::Vector2d(r.first_piola(1, 1), third_free ? r.first_piola(2, 2) : 0.0);
  };
  for (int iteration = 0; iteration < 50; ++iteration) {
    const Eigen::Vector2d residual = lateral(F);
    if (residual.norm() < 1e-13 * law.shear_modulus + 1e-300) {
      break;
    }
    Eigen::Matrix2d jacobian = Eigen::Matrix2d::Identity();
    const double h = 1e-7;
    for (int j = 0; j < (third_free ? 2 : 1); ++j) {
      const int index = j == 0 ? 1 : 2;
      Eigen::Matrix3d plus = F;
      Eigen::Matrix3d minus = F;
      plus(index, index) += h;
      minus(index, index) -= h;
      jacobian.col(j) = (lateral(plus) - lateral(minus)) / (2 * h);
    }
    if (!third_free) {
      jacobian(1, 1) = 1.0;
    }
    const Eigen::Vector2d step = jacobian.fullPivLu().solve(residual);
    F(1, 1) -= step(0);
    if (third_free) {
      F(2, 2) -= step(1);
    }
  }
  return F;
}

double cauchy_xx(const plystrain::materials::LawParameters& law, const Eigen::Matrix3d& F) {
  const Eigen::Matrix3d P = plystrain::materials::evaluate(law, F).first_piola;
  const Eigen::Matrix3d sigma = P * F.transpose() / F.determinant();
  return sigma(0, 0);
}

const nlohmann::json& only_layer(const nlohmann::json& results) {
  REQUIRE(results["layers"].size() == 1);
  return results["layers"][0];
}

}  // namespace

TEST_CASE("homogeneous strip, lateral free: uniaxial stretch", "[cli][run]") {
  const nlohmann::json results = run_case("cli/homogeneous-strip-free.toml", "uniaxial");
  const nlohmann::json& sheet = only_layer(results);
  CHECK(results["completed"] == true);
  CHECK(results["load_reached"].get<double>() == Approx(1.0));
  // A homogeneous layer: the peak is the applied strain and nothing concentrates.
  CHECK(sheet["peak_strain"].get<double>() == Approx(0.1).epsilon(1e-6));
  CHECK(sheet["concentration"].get<double>() == Approx(1.0).epsilon(1e-6));

  const auto library = plystrain::load_builtin_library();
  const auto& law = library.find("demo-elastomer")->law;
  const double lambda = 1.1;
  // The same law solved pointwise with traction-free lateral faces.
  const Eigen::Matrix3d F = homogeneous_state(law, lambda, 1.0, true);
  CHECK(sheet["peak_stress"].get<double>() == Approx(cauchy_xx(law, F)).epsilon(1e-6));
  // Incompressible neo-Hookean uniaxial Cauchy stress mu (lambda^2 - 1/lambda)
  // (Ogden, Non-linear Elastic Deformations, 1984); kappa/mu = 500 here, so
  // within a few mu/kappa.
  const double mu = plystrain::materials::initial_shear_modulus(law);
  const double kappa = plystrain::materials::initial_bulk_modulus(law);
  const double closed_form = mu * (lambda * lambda - 1.0 / lambda);
  CHECK(std::abs(sheet["peak_stress"].get<double>() / closed_form - 1.0) < 3.0 * mu / kappa);
}

TEST_CASE("homogeneous strip, lateral held: planar (pure-shear) stretch", "[cli][run]") {
  const nlohmann::json results = run_case("cli/homogeneous-strip-held.toml", "planar");
  const nlohmann::json& sheet = only_layer(results);
  CHECK(sheet["peak_strain"].get<double>() == Approx(0.1).epsilon(1e-6));
  CHECK(sheet["concentration"].get<double>() == Approx(1.0).epsilon(1e-6));
  const auto library = plystrain::load_builtin_library();
  const auto& law = library.find("demo-elastomer")->law;
  const double lambda = 1.1;
  const Eigen::Matrix3d F = homogeneous_state(law, lambda, 1.0, false);
  // The largest principal stress is sigma_xx here (sigma_33 > 0 is smaller).
  CHECK(sheet["peak_stress"].get<double>() == Approx(cauchy_xx(law, F)).epsilon(1e-6));
  // Incompressible pure shear: sigma_xx = mu (lambda^2 - lambda^-2) (Ogden 1984).
  const double mu = plystrain::materials::initial_shear_modulus(law);
  const double kappa = plystrain::materials::initial_bulk_modulus(law);
  const double closed_form = mu * (lambda * lambda - 1.0 / (lambda * lambda));
  CHECK(std::abs(sheet["peak_stress"].get<double>() / closed_form - 1.0) < 3.0 * mu / kappa);
}

TEST_CASE("homogeneous disk: equibiaxial stretch", "[cli][run]") {
  const nlohmann::json results = run_case("cli/homogeneous-disk.toml", "equibiaxial");
  const nlohmann::json& sheet = only_layer(results);
  CHECK(results["model"]["shape"] == "disk");
  CHECK(sheet["peak_strain"].get<double>() == Approx(0.1).epsilon(1e-6));
  CHECK(sheet["concentration"].get<double>() == Approx(1.0).epsilon(1e-6));
  const auto library = plystrain::load_builtin_library();
  const auto& law = library.find("demo-elastomer")->law;
  const double lambda = 1.1;
  const Eigen::Matrix3d F = homogeneous_state(law, lambda, lambda, false);
  CHECK(sheet["peak_stress"].get<double>() == Approx(cauchy_xx(law, F)).epsilon(1e-6));
  // Incompressible equibiaxial: sigma = mu (lambda^2 - lambda^-4) (Ogden 1984).
  const double mu = plystrain::materials::initial_shear_modulus(law);
  const double kappa = plystrain::materials::initial_bulk_modulus(law);
  const double closed_form = mu * (lambda * lambda - std::pow(lambda, -4.0));
  CHECK(std::abs(sheet["peak_stress"].get<double>() / closed_form - 1.0) < 3.0 * mu / kappa);
}

TEST_CASE("bilayer bending at small strain: the neutral-plane formula in both layers",
          "[cli][run]") {
  // Plate theory is a small-strain result: at a 200 mm radius the largest
  // strain is about 1e-4, so second-order terms (about strain^2) are far
  // below the 0.5 % tolerance of verification.md section 4.
  const nlohmann::json results = run_case("cli/bilayer-bend.toml", "bilayer");
  REQUIRE(results["layers"].size() == 2);
  const auto library = plystrain::load_builtin_library();
  const auto young_poisson = [&](const char* key) {
    const auto& law = library.find(key)->law;
    return plystrain::materials::to_young_poisson(plystrain::materials::initial_shear_modulus(law),
                                                  plystrain::materials::initial_bulk_modulus(law));
  };
  // Plane-strain moduli Ebar = E / (1 - nu^2) of the two layers (lateral held).
  const auto plane_strain_modulus = [&](const char* key) {
    const auto young = young_poisson(key);
    return young.youngs_modulus / (1.0 - young.poisson_ratio * young.poisson_ratio);
  };
  const double foil = 20.0;
  const double film = 2.0;
  const double radius = 200000.0;
  const double e_foil = plane_strain_modulus("demo-encapsulant");
  const double e_film = plane_strain_modulus("demo-stiff-film");
  // Laminate plate theory: y_N = sum(Ebar_i t_i y_i) / sum(Ebar_i t_i), and the
  // strain along x at height y is (y - y_N) / R (verification.md section 4;
  // for a film on a foil this is the formula of Suo, Ma, Gleskova & Wagner,
  // Appl. Phys. Lett. 74, 1177, 1999, which therefore is not a second check).
  const double neutral = (e_foil * foil * foil / 2 + e_film * film * (foil + film / 2)) /
                         (e_foil * foil + e_film * film);
  const auto along = [&](double y) { return (y - neutral) / radius; };
  // The largest principal strain at height y of a layer of Poisson ratio nu
  // in plane strain: along x, or through the thickness, where sigma_zz = 0
  // gives -nu / (1 - nu) times the strain along x (Hooke), or 0 out of plane.
  const auto largest_principal = [&](double y, double nu) {
    return std::max({along(y), -nu / (1.0 - nu) * along(y), 0.0});
  };
  // Each layer's reported peak against the formula at the reported point:
  // the film's at its top, the foil's wherever its principal strain is
  // largest, a second, independent sample of the same bending profile.
  const nlohmann::json& top = results["layers"][1];
  const double z_film = top["peak_at"][1].get<double>();
  CHECK(top["peak_strain"].get<double>() ==
        Approx(largest_principal(z_film, young_poisson("demo-stiff-film").poisson_ratio))
            .epsilon(5e-3));
  const nlohmann::json& bottom = results["layers"][0];
  const double z_foil = bottom["peak_at"][1].get<double>();
  CHECK(bottom["peak_strain"].get<double>() ==
        Approx(largest_principal(z_foil, young_poisson("demo-encapsulant").poisson_ratio))
            .epsilon(5e-3));
}

TEST_CASE("a stiff film at the middle of a symmetric sandwich sees almost no bending strain",
          "[cli][run]") {
  // By symmetry the neutral plane of a symmetric laminate is its mid-plane
  // (laminate plate theory, e.g. Timoshenko & Woinowsky-Krieger, Theory of
  // Plates and Shells, 1959, or verification.md section 4), so a film there
  // is strained by at most its own half-thickness over R, while the outer
  // faces see (H/2)/R: the neutral-plane design of flexible devices.
  const nlohmann::json results = run_case("cli/sandwich-bend.toml", "sandwich");
  REQUIRE(results["layers"].size() == 3);
  const double radius = 200000.0;
  const double half_total = (20.0 + 0.5 + 20.0) / 2.0;
  const double film_half = 0.5 / 2.0;
  const nlohmann::json& film = results["layers"][1];
  const nlohmann::json& above = results["layers"][2];
  // The film's peak is below its half-thickness over R (plus 1 % for the
  // integration points' own positions and round-off).
  CHECK(film["peak_strain"].get<double>() <= 1.01 * film_half / radius);
  // The outer layer's peak, carried to the top face along the linear profile
  // through the mid-plane, is (H/2)/R.
  const double z_peak = above["peak_at"][1].get<double>();
  const double extrapolated_top =
      above["peak_strain"].get<double>() * half_total / (z_peak - half_total);
  CHECK(extrapolated_top == Approx(half_total / radius).epsilon(5e-3));
  // Almost no strain: two orders of magnitude below the outer faces.
  CHECK(film["peak_strain"].get<double>() < 0.02 * extrapolated_top);
}

TEST_CASE("a film compressed past its wrinkling strain is reported as an unstable state",
          "[cli][run]") {
  // demo-stiff-film (E = 1000 MPa, nu = 0.35) on silicone-10to1 (E = 1.32
  // MPa, nu = 0.499): the wrinkling strain (1/4) (3 Es' / Ef')^(2/3) of a
  // film on a deep substrate (Chen & Hutchinson, J. Appl. Mech. 71 (2004)
  // 597; recalled from memory) is 0.69 %, with a 38 um wavelength; the
  // 60 um base is deep enough and the 150 um strip holds four of them. At
  // 1.4 % the flat state is unstable and the run must say so; at 0.35 % it
  // is stable and must not (the onset itself is checked against the formula
  // in verification/wrinkling_onset_test.cpp).
  const std::filesystem::path out = plystrain::test::fresh_output_dir("compressed-film");
  const auto result = run_plystrain("compare '" + data_path("cli/compressed-film.toml") +
                                    "' --out '" + out.string() + "'");
  INFO(result.out << "\n" << result.err);
  REQUIRE(result.exit_code == 0);
  const auto unstable_cautions = [](const nlohmann::json& results) {
    int count = 0;
    for (const nlohmann::json& caution : results["cautions"]) {
      count += caution.get<std::string>().find("unstable equilibrium") != std::string::npos ? 1 : 0;
    }
    return count;
  };
  const nlohmann::json past =
      nlohmann::json::parse(plystrain::test::read_text(out / "base" / "results.json"));
  const nlohmann::json below =
      nlohmann::json::parse(plystrain::test::read_text(out / "below-onset" / "results.json"));
  CHECK(unstable_cautions(past) == 1);
  CHECK(unstable_cautions(below) == 0);
  CHECK(result.out.find("unstable equilibrium") != std::string::npos);
  std::filesystem::remove_all(out);
}
