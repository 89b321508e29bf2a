// Errors found while turning a stack description into a mesh: a defect that
// cannot be built, a layer that is inconsistent, or a failure inside Gmsh.
// The error carries which defect or layer it concerns, so that the caller
// can point at the line of the case file that defined it.
#pragma once

#include <stdexcept>
#include <string>

namespace plystrain::mesh {

class MeshError : public std::runtime_error {
 public:
  enum class Subject { none, defect, layer };

  explicit MeshError(const std::string& message)
      : std::runtime_error(message) {}

  // `case_index` is StackDefect::case_index of the offending defect.
  [[nodiscard]] static MeshError for_defect(int case_index, const std::string& message) {
    return MeshError(Subject::defect, case_index, message);
  }
  // `layer_index` counts from the bottom layer (0).
  [[nodiscard]] static MeshError for_layer(int layer_index, const std::string& message) {
    return MeshError(Subject::layer, layer_index, message);
  }

  [[nodiscard]] Subject subject() const { return subject_; }
  [[nodiscard]] int index() const { return index_; }

 private:
  MeshError(Subject subject, int index, const std::string& message)
      : std::runtime_error(message), subject_(subject), index_(index) {}

  Subject subject_ = Subject::none;
  int index_ = -1;
};

}  // namespace plystrain::mesh
