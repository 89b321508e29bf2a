#include "plystrain/solver/field_writer.hpp"

#include "plystrain/solver/atomic_file.hpp"
#include "plystrain/solver/mesh_vtu_writer.hpp"
#include "plystrain/solver/results_writers.hpp"
#include "vtu_grid.hpp"

#include <vtkCellData.h>
#include <vtkDoubleArray.h>
#include <vtkFieldData.h>
#include <vtkIntArray.h>
#include <vtkNew.h>
#include <vtkPointData.h>
#include <vtkPoints.h>
#include <vtkUnstructuredGrid.h>

#include <array>
#include <cmath>
#include <cstdio>
#include <stdexcept>
#include <utility>

namespace plystrain {

namespace {

using RegionCopies = std::vector<std::pair<int, int>>;  // (region, copy) of one node

std::string snapshot_problem(const mesh::Mesh& mesh, const FieldSnapshot& snapshot) {
  const auto copies = static_cast<Eigen::Index>(snapshot.point_copies.size());
  if (snapshot.displacement.rows() != mesh.node_count()) {
    return std::string("displacement has ") + std::to_string(snapshot.displacement.rows()) +
           std::string(" rows for a mesh of ") + std::to_string(mesh.node_count()) + " nodes";
  }
  const std::array<std::pair<const char*, Eigen::Index>, 6> per_copy = {{
      {"max_principal_strain", snapshot.max_principal_strain.rows()},
      {"min_principal_strain", snapshot.min_principal_strain.rows()},
      {"log_strain", snapshot.log_strain.rows()},
      {"cauchy_stress", snapshot.cauchy_stress.rows()},
      {"von_mises_stress", snapshot.von_mises_stress.rows()},
      {"crack_ratio", snapshot.crack_ratio.rows()},
  }};
  for (const auto& [name, rows] : per_copy) {
    if (rows != copies) {
      return std::string(name) + " has " + std::to_string(rows) + " rows for " +
             std::to_string(copies) + " point copies";
    }
  }
  if (!std::isfinite(snapshot.load_factor)) {
    return "the load factor is not finite";
  }
  return {};
}

// Per mesh node, which copy each region's cells use.
std::vector<RegionCopies> copies_by_node(const mesh::Mesh& mesh, const FieldSnapshot& snapshot) {
  std::vector<RegionCopies> by_node(static_cast<std::size_t>(mesh.node_count()));
  for (std::size_t copy = 0; copy < snapshot.point_copies.size(); ++copy) {
    const auto [node, region] = snapshot.point_copies[copy];
    if (node < 0 || node >= mesh.node_count()) {
      throw std::invalid_argument(std::string("field output: point copy ") + std::to_string(copy) +
                                  std::string(" names node ") + std::to_string(node) +
                                  ", outside the mesh");
    }
    RegionCopies& entry = by_node[static_cast<std::size_t>(node)];
    for (const auto& [known_region, known_copy] : entry) {
      if (known_region == region) {
        throw std::invalid_argument(std::string("field output: node ") + std::to_string(node) +
                                    std::string(" has two copies for layer ") +
                                    std::to_string(region) + std::string(" (copies ") +
                                    std::to_string(known_copy) + " and " + std::to_string(copy) +
                                    ")");
      }
    }
    entry.emplace_back(region, static_cast<int>(copy));
  }
  return by_node;
}

int copy_of(const std::vector<RegionCopies>& by_node, int node, int region) {
  for (const auto& [known_region, copy] : by_node[static_cast<std::size_t>(node)]) {
    if (known_region == region) {
      return copy;
    }
  }
  throw std::invalid_argument(std::string("field output: node ") + std::to_string(node) +
                              std::string(" has no copy for layer ") + std::to_string(region) +
                              " although a cell of that layer uses it");
}

vtkNew<vtkDoubleArray> scalar_array(const char* name, const Eigen::VectorXd& values) {
  vtkNew<vtkDoubleArray> array;
  array->SetName(name);
  array->SetNumberOfComponents(1);
  array->SetNumberOfTuples(values.rows());
  for (Eigen::Index i = 0; i < values.rows(); ++i) {
    array->SetValue(i, values(i));
  }
  return array;
}

vtkNew<vtkDoubleArray> tensor_array(const char* name,
                                    const Eigen::Matrix<double, Eigen::Dynamic, 6>& values) {
  vtkNew<vtkDoubleArray> array;
  array->SetName(name);
  array->SetNumberOfComponents(6);
  array->SetNumberOfTuples(values.rows());
  // Component names let ParaView label XX ... XZ in the documented order.
  static constexpr std::array<const char*, 6> component_names = {"XX", "YY", "ZZ",
                                                                 "XY", "YZ", "XZ"};
  for (int k = 0; k < 6; ++k) {
    array->SetComponentName(k, component_names[static_cast<std::size_t>(k)]);
  }
  for (Eigen::Index i = 0; i < values.rows(); ++i) {
    for (int k = 0; k < 6; ++k) {
      array->SetComponent(i, k, values(i, k));
    }
  }
  return array;
}

std::string xml_escaped(const std::string& text) {
  std::string out;
  for (const char c : text) {
    switch (c) {
      case '&':
        out += "&amp;";
        break;
      case '<':
        out += "&lt;";
        break;
      case '>':
        out += "&gt;";
        break;
      case '"':
        out += "&quot;";
        break;
      case '\'':
        out += "&apos;";
        break;
      default:
        out += c;
    }
  }
  return out;
}

}  // namespace

void write_field_vtu(const std::filesystem::path& path, const mesh::Mesh& mesh,
                     const FieldSnapshot& snapshot, double length_scale) {
  if (!(length_scale > 0.0) || !std::isfinite(length_scale)) {
    throw std::invalid_argument("field output: the length scale must be positive and finite");
  }
  if (const std::string problem = snapshot_problem(mesh, snapshot); !problem.empty()) {
    throw std::invalid_argument(std::string("field output ") + path.string() + ": " + problem);
  }
  const std::vector<RegionCopies> by_node = copies_by_node(mesh, snapshot);
  const auto copies = static_cast<vtkIdType>(snapshot.point_copies.size());

  vtkNew<vtkPoints> points;
  points->SetDataTypeToDouble();
  points->SetNumberOfPoints(copies);
  vtkNew<vtkDoubleArray> displacement;
  displacement->SetName("displacement");
  displacement->SetNumberOfComponents(3);
  displacement->SetNumberOfTuples(copies);
  for (vtkIdType copy = 0; copy < copies; ++copy) {
    const int node = snapshot.point_copies[static_cast<std::size_t>(copy)][0];
    const Eigen::Vector2d& x = mesh.nodes[static_cast<std::size_t>(node)];
    points->SetPoint(copy, x.x() / length_scale, x.y() / length_scale, 0.0);
    displacement->SetTuple3(copy, snapshot.displacement(node, 0) / length_scale,
                            snapshot.displacement(node, 1) / length_scale, 0.0);
  }

  const auto grid = io::layered_cell_grid(mesh, points, [&](int cell, int node) {
    if (node < 0 || node >= mesh.node_count()) {
      throw std::invalid_argument(std::string("field output: cell ") + std::to_string(cell) +
                                  std::string(" refers to node ") + std::to_string(node) + ", outside the mesh");
    }
    return copy_of(by_node, node, mesh.cells[static_cast<std::size_t>(cell)].region);
  });
  grid->GetPointData()->AddArray(displacement);
  grid->GetPointData()->AddArray(
      scalar_array("max_principal_strain", snapshot.max_principal_strain));
  grid->GetPointData()->AddArray(
      scalar_array("min_principal_strain", snapshot.min_principal_strain));
  grid->GetPointData()->AddArray(tensor_array("log_strain", snapshot.log_strain));
  grid->GetPointData()->AddArray(tensor_array("cauchy_stress", snapshot.cauchy_stress));
  grid->GetPointData()->AddArray(scalar_array("von_mises_stress", snapshot.von_mises_stress));
  grid->GetPointData()->AddArray(scalar_array("crack_ratio", snapshot.crack_ratio));
  // The load factor travels with the file too, for readers opening one .vtu.
  vtkNew<vtkDoubleArray> time;
  time->SetName("TimeValue");
  time->SetNumberOfTuples(1);
  time->SetValue(0, snapshot.load_factor);
  grid->GetFieldData()->AddArray(time);

  // Every converged increment writes a file: with zlib the fields took
  // about 4 s of a 28 s run of the 30 % stretch benchmark, with LZ4 about
  // 1.3 s, for 30 % more bytes.
  write_file_atomically(path, io::vtu_file_text(grid, io::VtuCompression::lz4));
}

std::string field_collection_text(const std::vector<CollectionEntry>& entries) {
  std::string out =
      "<?xml version=\"1.0\"?>\n"
      "<VTKFile type=\"Collection\" version=\"0.1\" byte_order=\"LittleEndian\">\n"
      "  <Collection>\n";
  for (const CollectionEntry& entry : entries) {
    if (!std::isfinite(entry.time)) {
      throw std::invalid_argument(std::string("field collection: the time of ") + entry.file +
                                  " is not finite");
    }
    out += std::string("    <DataSet timestep=\"") + round_trip_number(entry.time) +
           std::string("\" group=\"\" part=\"0\" file=\"") + xml_escaped(entry.file) + "\"/>\n";
  }
  out +=
      "  </Collection>\n"
      "</VTKFile>\n";
  return out;
}

FieldSeriesWriter::FieldSeriesWriter(std::filesystem::path output_directory, mesh::Mesh mesh,
                                     double length_scale)
    : output_directory_(std::move(output_directory)),
      mesh_(std::move(mesh)),
      length_scale_(length_scale) {
  if (!(length_scale_ > 0.0) || !std::isfinite(length_scale_)) {
    throw std::invalid_argument("field output: the length scale must be positive and finite");
  }
  std::error_code error;
  std::filesystem::create_directories(output_directory_ / "fields", error);
  if (error) {
    throw std::runtime_error(std::string("cannot create ") +
                             (output_directory_ / "fields").string() + ": " + error.message());
  }
}

std::filesystem::path FieldSeriesWriter::collection_path() const {
  return output_directory_ / "fields.pvd";
}

std::filesystem::path FieldSeriesWriter::write_increment(const FieldSnapshot& snapshot) {
  char name[32];
  std::snprintf(name, sizeof name, "step-%04zu.vtu", entries_.size() + 1);
  const std::string relative = std::string("fields/") + name;
  const std::filesystem::path path = output_directory_ / "fields" / name;
  write_field_vtu(path, mesh_, snapshot, length_scale_);
  std::vector<CollectionEntry> entries = entries_;
  entries.push_back({snapshot.load_factor, relative});
  write_file_atomically(collection_path(), field_collection_text(entries));
  // Only a collection that was written counts as the series so far.
  entries_ = std::move(entries);
  return path;
}

}  // namespace plystrain
