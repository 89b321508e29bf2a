// ParaView output read back with VTK's own XML reader and parser: cell types
// and node order against VTK's definition of its quadratic cells (VTK User's
// Guide, 11th ed., Kitware 2010, "VTK file formats" and cell figures), every
// documented array with its component count, per-layer copies of interface
// nodes and a collection file that is well-formed XML.
#include "io_fixtures.hpp"

#include "plystrain/mesh/mesh.hpp"
#include "plystrain/solver/field_writer.hpp"

#include <catch2/catch.hpp>

#include <vtkCell.h>
#include <vtkCellData.h>
#include <vtkCellType.h>
#include <vtkDataArray.h>
#include <vtkFieldData.h>
#include <vtkNew.h>
#include <vtkPointData.h>
#include <vtkUnstructuredGrid.h>
#include <vtkXMLDataElement.h>
#include <vtkXMLDataParser.h>
#include <vtkXMLUnstructuredGridReader.h>

#include <cmath>
#include <fstream>
#include <map>

namespace {

using plystrain::mesh::Cell;
using plystrain::mesh::CellType;

Cell make_cell(CellType type, std::vector<int> nodes, int region) {
  Cell cell;
  cell.type = type;
  cell.region = region;
  for (std::size_t i = 0; i < nodes.size(); ++i) {
    cell.nodes[i] = nodes[i];
  }
  return cell;
}

// Three layers on [0, 2] x [0, 3] in Gmsh node order: a 9-node quad (bottom),
// an 8-node quad, and two 6-node triangles (top). Interfaces at z = 1 and 2.
plystrain::mesh::Mesh three_layer_mesh() {
  plystrain::mesh::Mesh mesh;
  mesh.nodes = {{0, 0},   {2, 0},   {2, 1},   {0, 1}, {1, 0},   {2, 0.5}, {1, 1},
                {0, 0.5}, {1, 0.5}, {2, 2},   {0, 2}, {2, 1.5}, {1, 2},   {0, 1.5},
                {2, 3},   {2, 2.5}, {1, 2.5}, {0, 3}, {1, 3},   {0, 2.5}};
  mesh.cells = {
      make_cell(CellType::quad9, {0, 1, 2, 3, 4, 5, 6, 7, 8}, 0),
      make_cell(CellType::quad8, {3, 2, 9, 10, 6, 11, 12, 13}, 1),
      make_cell(CellType::tri6, {10, 9, 14, 12, 15, 16}, 2),
      make_cell(CellType::tri6, {10, 14, 17, 16, 18, 19}, 2),
  };
  mesh.region_names = {"substrate", "electrode", "absorber"};
  return mesh;
}

// A value that differs per node and per layer, so a smeared interface shows.
double tagged_value(int node, int region, int component) {
  return 0.01 * (region + 1) + 1e-4 * node + 1e-7 * component;
}

plystrain::FieldSnapshot snapshot_for(const plystrain::mesh::Mesh& mesh, double load_factor) {
  plystrain::FieldSnapshot snapshot;
  snapshot.load_factor = load_factor;
  snapshot.displacement.resize(mesh.node_count(), 2);
  for (int n = 0; n < mesh.node_count(); ++n) {
    snapshot.displacement(n, 0) = 0.1 * load_factor * mesh.nodes[n].x();
    snapshot.displacement(n, 1) = -0.05 * load_factor * mesh.nodes[n].y();
  }
  std::map<std::pair<int, int>, bool> seen;
  for (const Cell& cell : mesh.cells) {
    for (int i = 0; i < cell.size(); ++i) {
      if (!seen[{cell.nodes[i], cell.region}]) {
        seen[{cell.nodes[i], cell.region}] = true;
        snapshot.point_copies.push_back({cell.nodes[i], cell.region});
      }
    }
  }
  const auto copies = static_cast<Eigen::Index>(snapshot.point_copies.size());
  snapshot.max_principal_strain.resize(copies);
  snapshot.min_principal_strain.resize(copies);
  snapshot.log_strain.resize(copies, 6);
  snapshot.cauchy_stress.resize(copies, 6);
  snapshot.von_mises_stress.resize(copies);
  snapshot.crack_ratio.resize(copies);
  for (Eigen::Index k = 0; k < copies; ++k) {
    const auto [node, region] = snapshot.point_copies[static_cast<std::size_t>(k)];
    snapshot.max_principal_strain(k) = load_factor * tagged_value(node, region, 0);
    snapshot.min_principal_strain(k) = -load_factor * tagged_value(node, region, 0);
    for (int c = 0; c < 6; ++c) {
      snapshot.log_strain(k, c) = tagged_value(node, region, c);
      snapshot.cauchy_stress(k, c) = 100.0 * tagged_value(node, region, c);
    }
    snapshot.von_mises_stress(k) = 50.0 * tagged_value(node, region, 0);
    snapshot.crack_ratio(k) = region == 2 ? snapshot.max_principal_strain(k) / 0.02 : 0.0;
  }
  return snapshot;
}

vtkSmartPointer<vtkUnstructuredGrid> read_grid(const std::filesystem::path& path) {
  vtkNew<vtkXMLUnstructuredGridReader> reader;
  reader->SetFileName(path.string().c_str());
  reader->Update();
  vtkSmartPointer<vtkUnstructuredGrid> grid = reader->GetOutput();
  REQUIRE(grid != nullptr);
  return grid;
}

// Mesh node at a point read back (points are unique in the test mesh).
int node_at(const plystrain::mesh::Mesh& mesh, const double* x, double length_scale) {
  for (int n = 0; n < mesh.node_count(); ++n) {
    if (std::abs(mesh.nodes[n].x() / length_scale - x[0]) < 1e-14 &&
        std::abs(mesh.nodes[n].y() / length_scale - x[1]) < 1e-14) {
      return n;
    }
  }
  return -1;
}

}  // namespace

TEST_CASE("a .vtu holds the quadratic cells, per-layer points and every array", "[fields]") {
  const plystrain::test::ScratchDirectory scratch("vtu");
  const plystrain::mesh::Mesh mesh = three_layer_mesh();
  const plystrain::FieldSnapshot snapshot = snapshot_for(mesh, 0.5);
  // Two interfaces of three nodes each: 20 nodes + 6 copies.
  REQUIRE(snapshot.point_copies.size() == 26);
  const double length_scale = 1000.0;  // written in mm
  const std::filesystem::path path = scratch.path() / "step.vtu";
  plystrain::write_field_vtu(path, mesh, snapshot, length_scale);

  // Binary inline data: the file must be well-formed XML.
  vtkNew<vtkXMLDataParser> parser;
  parser->SetFileName(path.string().c_str());
  REQUIRE(parser->Parse() == 1);

  const vtkSmartPointer<vtkUnstructuredGrid> grid = read_grid(path);
  REQUIRE(grid->GetNumberOfPoints() == 26);
  REQUIRE(grid->GetNumberOfCells() == 4);
  CHECK(grid->GetCellType(0) == VTK_BIQUADRATIC_QUAD);
  CHECK(grid->GetCellType(1) == VTK_QUADRATIC_QUAD);
  CHECK(grid->GetCellType(2) == VTK_QUADRATIC_TRIANGLE);
  CHECK(grid->GetCellType(3) == VTK_QUADRATIC_TRIANGLE);

  vtkPointData* point_data = grid->GetPointData();
  const std::map<std::string, int> documented = {
      {"displacement", 3}, {"max_principal_strain", 1}, {"min_principal_strain", 1},
      {"log_strain", 6},   {"cauchy_stress", 6},        {"von_mises_stress", 1},
      {"crack_ratio", 1}};
  for (const auto& [name, components] : documented) {
    INFO(name);
    vtkDataArray* array = point_data->GetArray(name.c_str());
    REQUIRE(array != nullptr);
    CHECK(array->GetNumberOfComponents() == components);
    CHECK(array->GetNumberOfTuples() == 26);
  }
  vtkDataArray* layer = grid->GetCellData()->GetArray("layer");
  REQUIRE(layer != nullptr);
  CHECK(layer->GetNumberOfComponents() == 1);
  CHECK(layer->GetTuple1(0) == 0);
  CHECK(layer->GetTuple1(1) == 1);
  CHECK(layer->GetTuple1(3) == 2);
  vtkDataArray* time = grid->GetFieldData()->GetArray("TimeValue");
  REQUIRE(time != nullptr);
  CHECK(time->GetTuple1(0) == 0.5);

  // Every point of every cell: position of its mesh node in mm, the node's
  // displacement, and the value of that node in that cell's layer.
  vtkDataArray* max_principal = point_data->GetArray("max_principal_strain");
  vtkDataArray* log_strain = point_data->GetArray("log_strain");
  vtkDataArray* stress = point_data->GetArray("cauchy_stress");
  vtkDataArray* displacement = point_data->GetArray("displacement");
  vtkDataArray* crack_ratio = point_data->GetArray("crack_ratio");
  for (vtkIdType c = 0; c < grid->GetNumberOfCells(); ++c) {
    const Cell& cell = mesh.cells[static_cast<std::size_t>(c)];
    vtkCell* vtk_cell = grid->GetCell(c);
    REQUIRE(vtk_cell->GetNumberOfPoints() == cell.size());
    for (int i = 0; i < cell.size(); ++i) {
      const vtkIdType point = vtk_cell->GetPointId(i);
      double x[3];
      grid->GetPoint(point, x);
      const int node = cell.nodes[i];
      CHECK(node_at(mesh, x, length_scale) == node);
      CHECK(x[2] == 0.0);
      CHECK(max_principal->GetTuple1(point) == 0.5 * tagged_value(node, cell.region, 0));
      CHECK(log_strain->GetComponent(point, 5) == tagged_value(node, cell.region, 5));
      CHECK(stress->GetComponent(point, 3) == 100.0 * tagged_value(node, cell.region, 3));
      CHECK(displacement->GetComponent(point, 0) == snapshot.displacement(node, 0) / length_scale);
      CHECK(displacement->GetComponent(point, 1) == snapshot.displacement(node, 1) / length_scale);
      CHECK(displacement->GetComponent(point, 2) == 0.0);
      CHECK(crack_ratio->GetTuple1(point) ==
            (cell.region == 2 ? 0.5 * tagged_value(node, 2, 0) / 0.02 : 0.0));
    }
  }

  // Interface node 6 (x = 1, z = 1) is the edge mid-node of the top of the
  // 9-node quad (local 6) and of the bottom of the 8-node quad (local 4):
  // two different points with the same position and different values.
  const vtkIdType below = grid->GetCell(0)->GetPointId(6);
  const vtkIdType above = grid->GetCell(1)->GetPointId(4);
  CHECK(below != above);
  CHECK(max_principal->GetTuple1(below) != max_principal->GetTuple1(above));
}

TEST_CASE("node order agrees with VTK's parametric definition of each cell", "[fields]") {
  // Each test cell is an affine image of its VTK reference cell, so every
  // point must sit at the affine image of VTK's parametric coordinates of
  // that point: a wrong node order puts a mid-node at a corner or elsewhere.
  const plystrain::test::ScratchDirectory scratch("vtu-order");
  const plystrain::mesh::Mesh mesh = three_layer_mesh();
  const std::filesystem::path path = scratch.path() / "order.vtu";
  plystrain::write_field_vtu(path, mesh, snapshot_for(mesh, 1.0), 1.0);
  const vtkSmartPointer<vtkUnstructuredGrid> grid = read_grid(path);
  for (vtkIdType c = 0; c < grid->GetNumberOfCells(); ++c) {
    vtkCell* cell = grid->GetCell(c);
    const double* parametric = cell->GetParametricCoords();
    REQUIRE(parametric != nullptr);
    const bool triangle = cell->GetCellType() == VTK_QUADRATIC_TRIANGLE;
    double origin[3];
    double along_r[3];
    double along_s[3];
    cell->GetPoints()->GetPoint(0, origin);
    cell->GetPoints()->GetPoint(1, along_r);
    cell->GetPoints()->GetPoint(triangle ? 2 : 3, along_s);
    for (int i = 0; i < cell->GetNumberOfPoints(); ++i) {
      const double r = parametric[3 * i];
      const double s = parametric[3 * i + 1];
      double x[3];
      cell->GetPoints()->GetPoint(i, x);
      for (int d = 0; d < 2; ++d) {
        INFO("cell " << c << " point " << i << " direction " << d);
        const double expected =
            origin[d] + r * (along_r[d] - origin[d]) + s * (along_s[d] - origin[d]);
        CHECK(x[d] == Approx(expected).margin(1e-12));
      }
    }
  }
}

TEST_CASE("the series rewrites a valid .pvd after every increment", "[fields]") {
  const plystrain::test::ScratchDirectory scratch("series");
  const plystrain::mesh::Mesh mesh = three_layer_mesh();
  plystrain::FieldSeriesWriter series(scratch.path(), mesh, 1.0);
  const std::vector<double> loads = {0.25, 0.5, 0.1 + 0.2 + 0.45};
  for (std::size_t step = 0; step < loads.size(); ++step) {
    const std::filesystem::path vtu = series.write_increment(snapshot_for(mesh, loads[step]));
    CHECK(std::filesystem::exists(vtu));

    vtkNew<vtkXMLDataParser> parser;
    parser->SetFileName(series.collection_path().string().c_str());
    REQUIRE(parser->Parse() == 1);
    vtkXMLDataElement* root = parser->GetRootElement();
    REQUIRE(root != nullptr);
    CHECK(std::string(root->GetName()) == "VTKFile");
    CHECK(std::string(root->GetAttribute("type")) == "Collection");
    vtkXMLDataElement* collection = root->FindNestedElementWithName("Collection");
    REQUIRE(collection != nullptr);
    REQUIRE(collection->GetNumberOfNestedElements() == static_cast<int>(step + 1));
    for (int k = 0; k <= static_cast<int>(step); ++k) {
      vtkXMLDataElement* dataset = collection->GetNestedElement(k);
      CHECK(std::string(dataset->GetName()) == "DataSet");
      double time = 0.0;
      REQUIRE(dataset->GetScalarAttribute("timestep", time) == 1);
      CHECK(time == loads[static_cast<std::size_t>(k)]);
      const std::string file = dataset->GetAttribute("file");
      char expected[32];
      std::snprintf(expected, sizeof expected, "fields/step-%04d.vtu", k + 1);
      CHECK(file == expected);
      CHECK(std::filesystem::exists(scratch.path() / file));
    }
  }
  CHECK(series.entries().size() == 3);
}

TEST_CASE("a snapshot that does not fit the mesh is refused and writes nothing", "[fields]") {
  const plystrain::test::ScratchDirectory scratch("series-refused");
  const plystrain::mesh::Mesh mesh = three_layer_mesh();
  plystrain::FieldSeriesWriter series(scratch.path(), mesh, 1.0);
  series.write_increment(snapshot_for(mesh, 0.5));
  const std::string collection_before = [&] {
    std::ifstream in(series.collection_path());
    return std::string(std::istreambuf_iterator<char>(in), {});
  }();

  plystrain::FieldSnapshot short_snapshot = snapshot_for(mesh, 0.75);
  short_snapshot.crack_ratio.resize(3);
  CHECK_THROWS_AS(series.write_increment(short_snapshot), std::invalid_argument);

  // Copy 9 is node 3 in layer 1 (the first node of the 8-node quad); a
  // stray copy replaces it, so that cell has no point for its node 3.
  plystrain::FieldSnapshot missing_copy = snapshot_for(mesh, 0.75);
  REQUIRE(missing_copy.point_copies[9] == std::array<int, 2>{3, 1});
  missing_copy.point_copies[9] = {0, 2};
  CHECK_THROWS_AS(series.write_increment(missing_copy), std::invalid_argument);

  CHECK(series.entries().size() == 1);
  CHECK_FALSE(std::filesystem::exists(scratch.path() / "fields" / "step-0002.vtu"));
  std::ifstream in(series.collection_path());
  CHECK(std::string(std::istreambuf_iterator<char>(in), {}) == collection_before);
  // Only the one good .vtu in fields/, no temporary files.
  int files = 0;
  for ([[maybe_unused]] const auto& entry :
       std::filesystem::directory_iterator(scratch.path() / "fields")) {
    ++files;
  }
  CHECK(files == 1);
}
