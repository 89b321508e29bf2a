// ParaView output of a run: one VTK unstructured grid (.vtu) per converged
// increment under <out>/fields/, and the collection <out>/fields.pvd that
// lists them with the load factor as time (results-format.md, "ParaView
// fields").
//
// Points are the reference positions (x, z, 0) or (r, z, 0) in the case's
// unit; cells keep their quadratic type. Nodal values are per layer: a node
// shared by two layers becomes one point per layer (FieldSnapshot::
// point_copies), so that each layer's cells refer to their own copy and no
// value is smeared across an interface.
#pragma once

#include "plystrain/mesh/mesh.hpp"
#include "plystrain/solver/results.hpp"

#include <filesystem>
#include <string>
#include <vector>

namespace plystrain {

// Writes one increment's fields as a .vtu (binary, base64 inline: well-formed
// XML). `length_scale` is micrometres per case unit; points and
// displacements are divided by it. Throws std::invalid_argument when the
// snapshot does not fit the mesh (array sizes, a cell whose (node, layer)
// has no copy) and std::runtime_error when the file cannot be written; the
// target is then left as it was.
void write_field_vtu(const std::filesystem::path& path, const mesh::Mesh& mesh,
                     const FieldSnapshot& snapshot, double length_scale);

// One dataset of a collection: a file (relative to the .pvd) and its time.
struct CollectionEntry {
  double time = 0.0;
  std::string file;
};

// The .pvd text (VTK has no writer for it).
[[nodiscard]] std::string field_collection_text(const std::vector<CollectionEntry>& entries);

// The series of a run. After every increment the .vtu is written first and
// the .pvd rewritten after it, so a run stopped at any point leaves a
// collection of exactly the increments that converged.
class FieldSeriesWriter {
 public:
  // Creates <output_directory>/fields/ when it does not exist.
  FieldSeriesWriter(std::filesystem::path output_directory, mesh::Mesh mesh, double length_scale);

  // Writes fields/step-NNNN.vtu (numbered 0001, 0002, ... in the order
  // written) and rewrites fields.pvd. Returns the path of the .vtu.
  std::filesystem::path write_increment(const FieldSnapshot& snapshot);

  [[nodiscard]] const std::vector<CollectionEntry>& entries() const { return entries_; }
  [[nodiscard]] std::filesystem::path collection_path() const;

 private:
  std::filesystem::path output_directory_;
  mesh::Mesh mesh_;
  double length_scale_;
  std::vector<CollectionEntry> entries_;
};

}  // namespace plystrain
