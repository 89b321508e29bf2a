// The bridge from a parsed case to the mesher's own stack description, and
// from the mesher's errors back to the case file's lines.
#pragma once

#include "plystrain/mesh/mesh_error.hpp"
#include "plystrain/mesh/stack.hpp"
#include "plystrain/solver/case_spec.hpp"
#include "plystrain/solver/input_error.hpp"

namespace plystrain {

[[nodiscard]] mesh::StackDescription stack_from_case(const CaseSpec& spec);

// A MeshError about a defect or layer becomes an InputError at the line of
// that defect or layer in the case file.
[[nodiscard]] InputError input_error_from_mesh_error(const mesh::MeshError& error,
                                                     const CaseSpec& spec);

}  // namespace plystrain
