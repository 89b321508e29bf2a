// Whole-or-nothing output: a writer that fails leaves the previous file as it
// was and no partial or temporary file beside it.
#include "io_fixtures.hpp"

#include "plystrain/mesh/mesh.hpp"
#include "plystrain/solver/field_writer.hpp"
#include "plystrain/solver/results_writers.hpp"

#include <catch2/catch.hpp>

#include <vtkObject.h>

#include <fstream>

namespace {

std::string read_text(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  return std::string(std::istreambuf_iterator<char>(in), {});
}

}  // namespace

TEST_CASE("a refused rewrite keeps the finished results.json", "[atomic]") {
  const plystrain::test::ScratchDirectory scratch("atomic-json");
  const std::filesystem::path path = scratch.path() / "results.json";
  plystrain::write_results_json(path, plystrain::test::sample_run(), {"um", 1.0});
  const std::string before = read_text(path);
  REQUIRE_FALSE(before.empty());
  CHECK_THROWS(plystrain::write_results_json(path, plystrain::test::sample_run(), {"um", -1.0}));
  CHECK(read_text(path) == before);
  CHECK(scratch.entry_count() == 1);
}

TEST_CASE("a VTK writer that cannot write leaves nothing behind", "[atomic]") {
  const plystrain::test::ScratchDirectory scratch("atomic-vtu");
  plystrain::mesh::Mesh mesh;
  mesh.nodes = {{0, 0}, {1, 0}, {0, 1}};
  plystrain::mesh::Cell cell;
  cell.type = plystrain::mesh::CellType::tri3;
  cell.nodes[0] = 0;
  cell.nodes[1] = 1;
  cell.nodes[2] = 2;
  mesh.cells = {cell};
  mesh.region_names = {"only"};
  plystrain::FieldSnapshot snapshot;
  snapshot.displacement = Eigen::MatrixX2d::Zero(3, 2);
  snapshot.point_copies = {{0, 0}, {1, 0}, {2, 0}};
  snapshot.max_principal_strain = Eigen::VectorXd::Zero(3);
  snapshot.min_principal_strain = Eigen::VectorXd::Zero(3);
  snapshot.log_strain = Eigen::Matrix<double, Eigen::Dynamic, 6>::Zero(3, 6);
  snapshot.cauchy_stress = Eigen::Matrix<double, Eigen::Dynamic, 6>::Zero(3, 6);
  snapshot.von_mises_stress = Eigen::VectorXd::Zero(3);
  snapshot.crack_ratio = Eigen::VectorXd::Zero(3);

  // The file itself can be written ...
  plystrain::write_field_vtu(scratch.path() / "good.vtu", mesh, snapshot, 1.0);
  CHECK(scratch.entry_count() == 1);
  // ... but not into a folder that does not exist: an error, and no debris.
  // VTK's own complaint on stderr is expected here and kept out of the log.
  vtkObject::GlobalWarningDisplayOff();
  CHECK_THROWS_AS(
      plystrain::write_field_vtu(scratch.path() / "absent" / "bad.vtu", mesh, snapshot, 1.0),
      std::runtime_error);
  vtkObject::GlobalWarningDisplayOn();
  CHECK(scratch.entry_count() == 1);
}

TEST_CASE("writing over a folder fails and removes the temporary file", "[atomic]") {
  const plystrain::test::ScratchDirectory scratch("atomic-folder");
  std::filesystem::create_directories(scratch.path() / "profiles.csv" / "inside");
  CHECK_THROWS_AS(plystrain::write_profiles_csv(scratch.path() / "profiles.csv", {}, {"um", 1.0}),
                  std::runtime_error);
  CHECK(scratch.entry_count() == 1);
  CHECK(std::filesystem::is_directory(scratch.path() / "profiles.csv"));
}
