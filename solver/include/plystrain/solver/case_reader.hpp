// Reads a case file (format version 1, docs/case-format-reference.md) into a
// checked CaseSpec. Every problem is an InputError naming
//   file:line:column: key path: what was expected, what was found
// Several problems are collected when that is easy; the first is always exact.
// A case that reads has also had each of its variants and sweep values
// resolved and checked.
#pragma once

#include "plystrain/solver/case_spec.hpp"
#include "plystrain/solver/material_library.hpp"

#include <filesystem>
#include <string_view>
#include <vector>

namespace plystrain {

// Loads the material library itself: the built-in one, then the case's
// `materials = [...]` files resolved relative to the case file.
[[nodiscard]] CaseSpec read_case(const std::filesystem::path& file);

// Checks materials against `library` as given (the case's `materials` files
// are not loaded; the caller has merged what it wants).
[[nodiscard]] CaseSpec read_case(const std::filesystem::path& file, const MaterialLibrary& library);

// Reads `text` as though it were the content of `file` (used for messages,
// for relative paths and for the default output directory).
[[nodiscard]] CaseSpec read_case_text(std::string_view text, const std::filesystem::path& file,
                                      const MaterialLibrary& library);

// The number of cells the case's mesh will have, estimated from the stack
// and the mesh sizes before meshing (an upper estimate; the reader refuses a
// case past limits::mesh_cells).
[[nodiscard]] double estimated_mesh_cells(const CaseSpec& spec);

// The case's material files, resolved relative to the case file.
[[nodiscard]] std::vector<std::filesystem::path> case_material_paths(const CaseSpec& spec);

}  // namespace plystrain
