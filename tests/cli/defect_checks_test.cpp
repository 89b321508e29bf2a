// End-to-end checks of defect cases through `plystrain run` and `plystrain
// compare`: a through-hole in a free plate against the Lamé annulus, a debond
// under a uniform stretch, a thin spot between its two limits, and the trend
// of a pinhole's concentration with substrate stiffness and a cover.
//
// The cases are in tests/data/cli; their materials (check-materials.toml) are
// neo-Hookean solids used at small strain, so that linear closed forms apply
// to within about the applied strain, relatively.
#include "cli/cli_support.hpp"
#include "cli/field_readback.hpp"
#include "cli/results_support.hpp"
#include "text_support.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

#include <vtkCellData.h>
#include <vtkDataArray.h>
#include <vtkIdList.h>
#include <vtkPointData.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <limits>
#include <map>
#include <regex>
#include <set>
#include <string>
#include <vector>

using plystrain::test::data_path;
using plystrain::test::layer_named;
using plystrain::test::read_text;
using plystrain::test::run_plystrain;

namespace {

// One thread: the checks run beside other builds on a small machine, and
// the results do not depend on the thread count. Returns the output
// directory (removed by the caller).
std::filesystem::path run_to(const std::string& case_file, const std::string& name) {
  const std::filesystem::path out = plystrain::test::fresh_output_dir(name);
  const auto result =
      run_plystrain("run '" + data_path(case_file) + "' --out '" + out.string() + "' --threads 1");
  INFO(result.out << "\n" << result.err);
  REQUIRE(result.exit_code == 0);
  return out;
}

nlohmann::json run_case(const std::string& case_file, const std::string& name) {
  const std::filesystem::path out = run_to(case_file, name);
  nlohmann::json json = nlohmann::json::parse(read_text(out / "results.json"));
  std::filesystem::remove_all(out);
  return json;
}

// The contact line of a run's log: "contact: P node pairs, C closed; largest
// penetration ..., largest contact pressure ..., largest opening ...,
// largest slip ...".
struct ContactLine {
  int pairs = -1;
  int closed = -1;
  double penetration = 0.0;
  double pressure = 0.0;
  double opening = 0.0;
  double slip = 0.0;
};

ContactLine contact_line(const std::filesystem::path& out) {
  const std::regex pattern(
      "contact: ([0-9]+) node pairs, ([0-9]+) closed; largest penetration (\\S+) um, largest "
      "contact pressure (\\S+) MPa, largest opening (\\S+) um, largest slip (\\S+) um");
  for (const std::string& line : plystrain::test::read_lines(out / "log.txt")) {
    std::smatch match;
    if (std::regex_search(line, match, pattern)) {
      return {std::stoi(match[1]), std::stoi(match[2]), std::stod(match[3]),
              std::stod(match[4]), std::stod(match[5]), std::stod(match[6])};
    }
  }
  FAIL("no contact line in " << (out / "log.txt").string());
  return {};
}

// Runs `compare` and returns the output directory (removed by the caller).
std::filesystem::path compare_case(const std::string& case_file, const std::string& name) {
  const std::filesystem::path out = plystrain::test::fresh_output_dir(name);
  const auto result = run_plystrain("compare '" + data_path(case_file) + "' --out '" +
                                    out.string() + "' --threads 1");
  INFO(result.out << "\n" << result.err);
  REQUIRE(result.exit_code == 0);
  return out;
}

nlohmann::json results_of(const std::filesystem::path& out, const std::string& run) {
  return nlohmann::json::parse(read_text(out / run / "results.json"));
}

// The mean through the thickness of the axial displacement u_x of one layer
// along the node column nearest to `x_target`, by the trapezoidal rule over
// the column's nodes (exact for the part of u_x that is linear in z, which
// holds the membrane stretch and the bending of the layer). Returns the
// column's x and the mean.
struct ColumnMean {
  double x = 0.0;
  double mean_displacement = 0.0;
};

ColumnMean column_mean_displacement(vtkUnstructuredGrid& grid, int layer, double x_target) {
  vtkDataArray* layer_of_cell = grid.GetCellData()->GetArray("layer");
  vtkDataArray* displacement = grid.GetPointData()->GetArray("displacement");
  REQUIRE(layer_of_cell != nullptr);
  REQUIRE(displacement != nullptr);
  std::set<vtkIdType> layer_points;
  for (vtkIdType cell = 0; cell < grid.GetNumberOfCells(); ++cell) {
    if (static_cast<int>(layer_of_cell->GetComponent(cell, 0)) != layer) {
      continue;
    }
    vtkNew<vtkIdList> ids;
    grid.GetCellPoints(cell, ids);
    for (vtkIdType i = 0; i < ids->GetNumberOfIds(); ++i) {
      layer_points.insert(ids->GetId(i));
    }
  }
  REQUIRE(!layer_points.empty());
  double column_x = 0.0;
  double best = std::numeric_limits<double>::infinity();
  for (const vtkIdType id : layer_points) {
    const double distance = std::abs(grid.GetPoint(id)[0] - x_target);
    if (distance < best) {
      best = distance;
      column_x = grid.GetPoint(id)[0];
    }
  }
  std::map<double, double> by_height;  // z -> u_x
  for (const vtkIdType id : layer_points) {
    const double* position = grid.GetPoint(id);
    if (std::abs(position[0] - column_x) <= 1e-9 * std::max(1.0, std::abs(column_x))) {
      by_height[position[1]] = displacement->GetComponent(id, 0);
    }
  }
  REQUIRE(by_height.size() >= 3);
  double integral = 0.0;
  for (auto above = std::next(by_height.begin()); above != by_height.end(); ++above) {
    const auto below = std::prev(above);
    integral += 0.5 * (above->second + below->second) * (above->first - below->first);
  }
  const double height = by_height.rbegin()->first - by_height.begin()->first;
  return {column_x, integral / height};
}

// The last converged increment of a run, read with VTK's own reader.
vtkSmartPointer<vtkUnstructuredGrid> last_fields(const std::filesystem::path& run_dir) {
  const plystrain::test::CollectionReadback collection =
      plystrain::test::read_collection(run_dir / "fields.pvd");
  REQUIRE(collection.parsed);
  REQUIRE(!collection.entries.empty());
  const plystrain::test::VtuReadback last =
      plystrain::test::read_vtu(run_dir / collection.entries.back().file);
  REQUIRE(last.problems == 0);
  REQUIRE(last.grid != nullptr);
  return last.grid;
}

// Composite beam with plane sections (transformed section: Timoshenko,
// Strength of Materials, Part I, 3rd ed., 1955, beams of two materials and
// eccentric axial load): the film's membrane strain in the thinned section
// over the film's strain far away, for a film of plane-strain modulus
// film_modulus and thickness h on a base of base_modulus and thickness H
// (H = 0: no base). Derived here:
// - far away the stack carries the axial force N through the modulus-
//   weighted centroid z_far of the full section, in pure tension:
//   film strain N / EA_far;
// - the thinned section has its own centroid z_thin, lower; N then also
//   bends it with M = N (z_far - z_thin), so the film, whose centroid z_f
//   lies above z_thin, strains N / EA_thin + M (z_f - z_thin) / EI_thin.
// Without a base z_f = z_thin and the ratio is EA_far / EA_thin = 1/(1 - d),
// the series limit; for a rigid base it tends to 1. It assumes the full
// shear transfer of plane sections, which a spot only twice as long as the
// stack is thick does not develop, so it is an upper estimate.
double composite_beam_ratio(double film_modulus, double h, double d, double base_modulus,
                            double H) {
  struct Section {
    double ea = 0.0;
    double centroid = 0.0;
    double ei = 0.0;
    double film_centroid = 0.0;
  };
  const auto section = [&](double film_thickness) {
    Section out;
    const double ea_film = film_modulus * film_thickness;
    const double ea_base = base_modulus * H;
    const double z_film = H + 0.5 * film_thickness;
    const double z_base = 0.5 * H;
    out.ea = ea_film + ea_base;
    out.centroid = (ea_film * z_film + ea_base * z_base) / out.ea;
    out.ei = film_modulus * std::pow(film_thickness, 3) / 12.0 +
             ea_film * std::pow(z_film - out.centroid, 2) + base_modulus * std::pow(H, 3) / 12.0 +
             ea_base * std::pow(z_base - out.centroid, 2);
    out.film_centroid = z_film;
    return out;
  };
  const Section full = section(h);
  const Section thinned = section(h * (1.0 - d));
  const double moment_per_force = full.centroid - thinned.centroid;
  const double thinned_film_strain =
      1.0 / thinned.ea + moment_per_force * (thinned.film_centroid - thinned.centroid) / thinned.ei;
  const double far_film_strain = 1.0 / full.ea;
  return thinned_film_strain / far_film_strain;
}

double plane_strain_modulus(double youngs_modulus, double poisson_ratio) {
  return youngs_modulus / (1.0 - poisson_ratio * poisson_ratio);
}

}  // namespace

TEST_CASE("through-hole in a free plate: Lamé annulus (equibiaxial Kirsch)",
          "[cli][defects][lame]") {
  // Case: a single layer, 1 um thick, radius b = 100 um, with a through-hole
  // of radius a = 10 um (pinhole of size 20), no substrate, stretched
  // equibiaxially by eps = 1e-3: the rim carries the radial stress of the
  // plate without its hole, sigma_0 = E eps / (1 - nu) (a dead traction, the
  // loading of an isolated defect); E = 100 MPa, nu = 0.3.
  //
  // Lamé annulus, plane stress (Timoshenko & Goodier, Theory of Elasticity,
  // 3rd ed., 1970, thick-walled cylinder): u = A r + B / r, so
  //   eps_r = A - B/r^2, eps_theta = A + B/r^2,
  //   sigma_r = E/(1 - nu^2) [(1 + nu) A - (1 - nu) B/r^2].
  // A free hole, sigma_r(a) = 0, gives B = (1 + nu)/(1 - nu) A a^2; the rim,
  // sigma_r(b) = sigma_0 = E/(1 - nu^2) (1 + nu) eps, gives
  // A (1 - a^2/b^2) = eps. The hoop strain at the hole is eps_theta(a) =
  // A (1 + (1 + nu)/(1 - nu)) = 2 A/(1 - nu). As b/a grows it tends to
  // 2 eps/(1 - nu), the equibiaxial Kirsch result (stress concentration 2)
  // written as a strain; the finite disk, loaded by a stress on a net
  // section reduced by the hole, concentrates by 1/(1 - a^2/b^2) more.
  //
  // Derived: eps_r + eps_theta = 2 A is constant, so the plane-stress
  // thickness strain -nu/(1 - nu) (eps_r + eps_theta) is uniform; with
  // u_z linear in z and u_r independent of z, every 3D equation and the free
  // faces are satisfied. The plane-stress solution is therefore the exact
  // axisymmetric solution for any thickness, which is why a 1 um plate with
  // a 10 um hole is a fair model of it.
  //
  // Why averaging_radius = 0: the hoop strain falls off as 1/r^2 from the
  // hole, and no corner is singular here, so the raw integration-point peak
  // converges; a disc average would pull it down by about (radius/a) and
  // hide the comparison. The raw peak sits at the integration point nearest
  // to the hole, a fraction of an element away from r = a, so the closed form
  // is evaluated both there (tight) and at r = a (within that offset).
  const nlohmann::json results = run_case("cli/pinhole-plate-disk.toml", "lame-plate");
  REQUIRE(results["completed"] == true);
  const nlohmann::json& plate = layer_named(results, "plate");

  const double nu = 0.3;
  const double a = 10.0;
  const double b = 100.0;
  const double eps = 1e-3;
  const double k = (1.0 + nu) / (1.0 - nu);
  const double A = eps / (1.0 - a * a / (b * b));
  const double B = k * A * a * a;
  const auto hoop = [&](double r) { return A + B / (r * r); };

  const double peak = plate["peak_strain"].get<double>();
  const double r_peak = plate["peak_at"][0].get<double>();
  INFO("peak " << peak << " at r = " << r_peak << "; Lamé there " << hoop(r_peak)
               << ", at the hole " << hoop(a));
  CHECK(r_peak >= a);
  CHECK(r_peak < a + 0.25);  // within the first cell (size_near 0.25)
  // The neo-Hookean law departs from the linear one by O(eps) relatively:
  // 0.3 % covers it (measured 0.07 %).
  CHECK(peak == Approx(hoop(r_peak)).epsilon(3e-3));
  // At the hole itself, within the integration-point offset (measured -0.27 %).
  CHECK(peak == Approx(2.0 * A / (1.0 - nu)).epsilon(5e-3));

  // The concentration is taken against the undisturbed state, the plate
  // without its hole under the same rim displacement: a uniform equibiaxial
  // strain eps (its largest principal strain; the thickness strain is
  // negative). The Lamé finite-disk concentration is therefore
  // eps_theta(a) / eps, within 1 % (the integration-point offset above).
  const double far = plate["far_field_strain"].get<double>();
  CHECK(far == Approx(eps).epsilon(1e-6));
  CHECK(plate["concentration"].get<double>() == Approx(peak / far).epsilon(1e-12));
  CHECK(plate["concentration"].get<double>() == Approx(2.0 * A / (1.0 - nu) / eps).epsilon(1e-2));
  // Near the rim the Lamé hoop strain is the largest principal strain; the
  // outer 5 % of the radius, from 95 um, is where strain_at_cell_edge is read.
  CHECK(plate["strain_at_cell_edge"].get<double>() == Approx(hoop(0.95 * b)).epsilon(1e-2));
  // Above the Kirsch infinite-plate value 2/(1 - nu), by the net-section
  // factor 1/(1 - a^2/b^2) = 1.0101 at most.
  CHECK(plate["concentration"].get<double>() > 2.0 / (1.0 - nu));
  CHECK(plate["concentration"].get<double>() <
        2.0 / (1.0 - nu) / (1.0 - a * a / (b * b)) * (1.0 + 3e-3));
}

TEST_CASE("uniform stretch over a local debond: no concentration, the faces closed at no pressure",
          "[cli][defects][debond]") {
  // Case: base (E = 10) / film (E = 1000, 0.5 um) / cover (E = 20), the
  // film debonded from the base over 10 um around the symmetry plane, 2 %
  // stretch through the outer edge, lateral free.
  //
  // Equilibrium (common practice, a closed form in itself): the piecewise
  // homogeneous state (every layer at the same axial stretch 1.02 and the
  // same out-of-plane strain, each free to contract through its thickness)
  // has sigma_zz = sigma_xz = 0 everywhere, so no interface carries a
  // traction. It satisfies every equation of the bonded stack and of the
  // stack with the debond alike (the debonded faces are traction-free and
  // move together), and it meets the boundary conditions (u_x = 0 on the
  // symmetry plane, u_x = 0.02 width on the edge). Homogeneous fields are
  // exact for any element, so the solver must return it to rounding: peak =
  // far field = 0.02 in every layer, concentration 1; and the debonded faces,
  // modelled as node pairs in contact, stay closed at zero pressure without
  // sliding. The next check gives the debond a load it changes.
  const std::filesystem::path out = run_to("cli/debond-uniform-strip.toml", "debond");
  const nlohmann::json results = nlohmann::json::parse(read_text(out / "results.json"));
  REQUIRE(results["completed"] == true);
  REQUIRE(results["layers"].size() == 3);
  for (const nlohmann::json& layer : results["layers"]) {
    INFO("layer " << layer["name"]);
    CHECK(layer["peak_strain"].get<double>() == Approx(0.02).epsilon(1e-9));
    CHECK(layer["far_field_strain"].get<double>() == Approx(0.02).epsilon(1e-9));
    CHECK(layer["raw_peak_strain"].get<double>() == Approx(0.02).epsilon(1e-9));
    CHECK(layer["concentration"].get<double>() == Approx(1.0).epsilon(1e-9));
  }
  const ContactLine contact = contact_line(out);
  CHECK(contact.pairs > 0);  // the debond is in the model
  CHECK(contact.closed == contact.pairs);
  CHECK(contact.pressure < 1e-9);
  CHECK(contact.penetration < 1e-9);
  CHECK(contact.slip < 1e-9);
  std::filesystem::remove_all(out);
}

TEST_CASE("a film cut beside a debond carries no in-plane force over the debond",
          "[cli][defects][debond]") {
  // Case: a 0.5 um film (E = 1000, nu_f = 0.3) on a 10 um base (E = 100),
  // the film cut through over 1 um at the symmetry plane and debonded from
  // the base over 20 um either side, 0.05 % stretch, lateral free.
  //
  // Statics (a free body, common practice): between the cut and the end of
  // the debond the film has a free end, a free top and a frictionless
  // bottom, so no shear reaches it and its axial force is zero along the
  // whole span; with sigma_xx = sigma_zz = 0 and the stack's common
  // out-of-plane strain eps_3 (generalized plane strain), Hooke's law gives
  // the mid-line strain eps_xx = -nu_f eps_3, about an eighth of the applied
  // strain here. Bonded, the film would take the stretch back from the base
  // by shear lag within a few of its load-transfer lengths: the same case
  // without the debond puts 0.58 to 1.00 of the applied strain into the
  // film from 1 to 16 um (measured), which this check refuses.
  // Measured: within 0.016 of the applied strain of -nu_f eps_3 from 1 to
  // 16 um (a few film thicknesses clear of the cut and of the debond's end,
  // where the film bends).
  const std::filesystem::path out = run_to("cli/slit-over-debond.toml", "slit-debond");
  const double applied = 5e-4;
  const double film_poisson = 0.3;
  const std::vector<std::string> lines = plystrain::test::read_lines(out / "profiles.csv");
  REQUIRE(lines.size() > 1);
  REQUIRE(lines[0] == "layer,x,z,strain_along,strain_across,strain_third,max_principal");
  int samples = 0;
  for (std::size_t i = 1; i < lines.size(); ++i) {
    const std::vector<std::string> field = plystrain::test::split(lines[i]);
    const double x = std::stod(field[1]);
    if (field[0] != "film" || x < 1.0 || x > 16.0) {
      continue;
    }
    INFO("film at x = " << x);
    const double along = std::stod(field[3]);
    const double third = std::stod(field[5]);
    CHECK(std::abs(along + film_poisson * third) < 0.05 * applied);
    ++samples;
  }
  CHECK(samples >= 20);
  // The faces slide by less than a cell, where node-to-node contact holds.
  const ContactLine contact = contact_line(out);
  CHECK(contact.pairs > 0);
  CHECK(contact.slip < 0.25);
  std::filesystem::remove_all(out);
}

TEST_CASE("thin spot: between the rigid-substrate and the free-standing limits",
          "[cli][defects][thin-spot]") {
  // Case: a film (E = 1000 MPa, nu = 0.3, h = 1 um) with a thin spot of
  // depth d = 0.5 (half its thickness missing over 20 um, 2 um tapers) on a
  // 10 um base (nu = 0.45), 0.1 % stretch, plane strain, 600 um half-width
  // (long against the load-transfer length, so that the film far from the
  // spot carries the applied stretch). Runs: base E = 1 MPa, no base
  // (free-standing), E = 10 and 100 MPa.
  //
  // Limits (strength of materials, springs in series):
  // - held by a rigid substrate, the film strains like the substrate
  //   everywhere: ratio 1;
  // - a free-standing film carries one axial force N = Ebar h eps along its
  //   length, so the thinned section, of thickness h (1 - d), strains
  //   h / (h (1 - d)) = 1/(1 - d) = 2 times the full section.
  // A bonded substrate takes over part of the force under the spot and
  // brings the ratio down from the free-standing value, the more the stiffer
  // it is. It also lends the stack a lever arm: the thinned section's
  // centroid is lower than the load line, the stack bends there and the film,
  // on top, takes extra tension. On a base as compliant as 1 MPa this can
  // lift the film's membrane strain slightly above 1/(1 - d) (measured
  // +0.9 %); composite_beam_ratio above gives the plane-sections estimate of
  // both effects, and the measured ratios lie below it.
  //
  // These are statements about the film's section-mean (membrane) strain.
  // It is measured from the displacement field: the through-thickness mean
  // of u_x at a node column inside the spot divided by its distance from the
  // symmetry plane (where u_x = 0), against the same mean's slope between two
  // columns far from the spot. The mean is blind to the bending of the
  // thinned film itself, which adds to the local peak: the reported
  // (disc-averaged) peak is therefore only checked from below and for its
  // ordering (measured 2.10 times the applied strain on the softest base).
  const std::filesystem::path out = compare_case("cli/thin-spot-film.toml", "thin-spot");
  const double d = 0.5;
  const double series_limit = 1.0 / (1.0 - d);
  const double applied = 1e-3;
  const double width = 600.0;
  const double film_modulus = plane_strain_modulus(1000.0, 0.3);
  const std::map<std::string, double> base_modulus = {
      {"base", plane_strain_modulus(1.0, 0.45)},
      {"free-standing", 0.0},
      {"medium-base", plane_strain_modulus(10.0, 0.45)},
      {"firm-base", plane_strain_modulus(100.0, 0.45)}};
  std::map<std::string, double> membrane_ratio;
  std::map<std::string, double> peak_ratio;
  for (const auto& [run, modulus] : base_modulus) {
    INFO("run " << run);
    const nlohmann::json results = results_of(out, run);
    REQUIRE(results["completed"] == true);
    int film_index = -1;
    for (std::size_t i = 0; i < results["layers"].size(); ++i) {
      if (results["layers"][i]["name"] == "film") {
        film_index = static_cast<int>(i);
      }
    }
    REQUIRE(film_index >= 0);
    vtkSmartPointer<vtkUnstructuredGrid> grid = last_fields(out / run);
    // Inside the spot's flat core (0..8 um), and over the outer third.
    const ColumnMean inside = column_mean_displacement(*grid, film_index, 4.0);
    const ColumnMean far_from = column_mean_displacement(*grid, film_index, 400.0);
    const ColumnMean edge = column_mean_displacement(*grid, film_index, width);
    REQUIRE(inside.x > 2.0);
    REQUIRE(inside.x < 6.0);
    REQUIRE(edge.x == Approx(width));
    const double thinned_strain = inside.mean_displacement / inside.x;
    const double full_strain =
        (edge.mean_displacement - far_from.mean_displacement) / (edge.x - far_from.x);
    const double ratio = thinned_strain / full_strain;
    const double beam =
        composite_beam_ratio(film_modulus, 1.0, d, modulus, run == "free-standing" ? 0.0 : 10.0);
    membrane_ratio[run] = ratio;
    peak_ratio[run] = layer_named(results, "film")["peak_strain"].get<double>() / applied;
    INFO("thinned section " << thinned_strain << ", full section " << full_strain
                            << ", membrane ratio " << ratio << ", composite beam " << beam
                            << ", reported peak / applied " << peak_ratio[run]);
    // Above the rigid-substrate limit, at most the plane-sections estimate
    // and within 4 % of it (measured 0.05 % to 2.3 % below).
    CHECK(ratio > 1.0);
    CHECK(ratio <= beam * (1.0 + 2e-3));
    CHECK(ratio >= beam * (1.0 - 4e-2));
    CHECK(peak_ratio[run] > 1.0);
  }
  // The free-standing film is the series limit itself: force continuity
  // makes the membrane ratio exactly 1/(1 - d), up to the discretisation
  // (measured 1.9990).
  CHECK(membrane_ratio["free-standing"] == Approx(series_limit).epsilon(2e-3));
  CHECK(membrane_ratio["medium-base"] < series_limit);
  CHECK(membrane_ratio["firm-base"] < series_limit);
  // A stiffer substrate holds the film closer to its own strain.
  CHECK(membrane_ratio["base"] > membrane_ratio["medium-base"]);
  CHECK(membrane_ratio["medium-base"] > membrane_ratio["firm-base"]);
  CHECK(peak_ratio["base"] > peak_ratio["medium-base"]);
  CHECK(peak_ratio["medium-base"] > peak_ratio["firm-base"]);
  std::filesystem::remove_all(out);
}

TEST_CASE("pinhole: concentration rises with a more compliant substrate, falls under a cover",
          "[cli][defects][pinhole-trend]") {
  // Case: a film (E = 1000 MPa, nu = 0.3, 0.5 um) with a circular pinhole of
  // 10 um diameter on a 10 um base, radius 60 um, 0.1 % equibiaxial stretch.
  // Base run: E_base = 1 MPa under a 10 um cover (E = 20 MPa) that fills the
  // hole; variants without the cover on bases of E = 1, 10 and 100 MPa.
  //
  // Source: shear-lag load transfer from a substrate into a film that is cut
  // (recalled from memory: Hu & Evans, Acta Metall. 37, 917, 1989, and Xia &
  // Hutchinson, J. Mech. Phys. Solids 48, 1107, 2000): the film's edge at a
  // cut is traction-free and the film is loaded back to the far-field strain
  // over a transfer length that grows with Ebar_film / Ebar_substrate. The
  // film near the hole then behaves more like a free plate with a hole, the
  // more compliant the substrate: the concentration climbs from 1 (rigid
  // substrate, the film cannot strain differently from it) towards the free
  // plate's equibiaxial Kirsch value in strain, 2/(1 - nu) = 2.86 (plane
  // stress: hoop strain 2 sigma/E at the hole over (1 - nu) sigma/E far
  // away). A bonded cover adds a second path for the load around the hole
  // and holds the film's edge, so it lowers the concentration (common
  // practice; verification.md section 5).
  const std::filesystem::path out = compare_case("cli/pinhole-film-disk.toml", "pinhole-trend");
  const nlohmann::json comparison = nlohmann::json::parse(read_text(out / "comparison.json"));
  std::map<std::string, double> concentration;
  for (const nlohmann::json& row : comparison["rows"]) {
    if (row["layer"] == "film") {
      REQUIRE(row["completed"] == true);
      REQUIRE(row["concentration"].is_number());
      concentration[row["variant"].get<std::string>()] = row["concentration"].get<double>();
    }
  }
  REQUIRE(concentration.size() == 4);
  const double kirsch_free_plate = 2.0 / (1.0 - 0.3);
  for (const auto& [run, value] : concentration) {
    INFO(run << ": film concentration " << value);
    CHECK(value > 1.0);
    CHECK(value < kirsch_free_plate);
  }
  // The substrate ordering, with no cover (measured 2.72, 2.61, 2.00).
  CHECK(concentration["bare-soft"] > concentration["bare-medium"]);
  CHECK(concentration["bare-medium"] > concentration["bare-firm"]);
  // The cover on the same soft base (measured 2.37 against 2.72).
  CHECK(concentration["base"] < concentration["bare-soft"]);
  std::filesystem::remove_all(out);
}
