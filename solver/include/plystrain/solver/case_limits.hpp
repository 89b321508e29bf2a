// The documented limits of a case file (docs/case-format-reference.md,
// "Limits"). Each keeps a hostile or mistaken file from crashing, hanging or
// flooding the reader, or from passing `check` with a value the mesher or
// the solver cannot honour. The reader refuses a case past any of them with
// file:line:column, the key and the limit.
#pragma once

#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

namespace plystrain::limits {

// The file (a case or a material file).
inline constexpr std::uintmax_t case_file_bytes = 1024 * 1024;
// Levels of tables, dotted-key parts, arrays and inline tables from the top
// of the file to the deepest value. The deepest case the format needs is a
// variant `set` written as nested tables (eight levels as counted).
inline constexpr int nesting_depth = 16;

// Text.
inline constexpr std::size_t name_characters = 64;    // layer and variant names
inline constexpr std::size_t text_characters = 1000;  // any other string

// Counts.
inline constexpr std::size_t layers = 50;
inline constexpr std::size_t defects = 50;
inline constexpr std::size_t variants = 100;
inline constexpr std::size_t changes_per_variant = 100;
inline constexpr std::size_t sweep_values = 1000;
inline constexpr std::size_t bend_radii = 20;  // each is a solve of its own
inline constexpr std::size_t profile_points = 10000;
inline constexpr std::size_t material_files = 20;

// Lengths, after conversion to micrometres: no length is larger than
// 10 m, and none but zero is smaller than 0.1 nm (an atom).
inline constexpr double largest_length_um = 1e7;
inline constexpr double smallest_length_um = 1e-4;

// The smallest feature the mesher is asked to resolve (a layer, a defect, a
// taper, a recess or what is left under it, the gap between two defect
// edges) as a share of the model's extent (the larger of the modelled span
// and the stack thickness), and at least smallest_length_um. Past it the
// cells along a thin film are more than 10^4 times longer than thick (the
// far size is a fortieth of the width, a film gets three cells across).
inline constexpr double smallest_feature_ratio = 1e-6;

// The mesh the case asks for, estimated from the stack and the mesh sizes
// before meshing: about 8 million unknowns with quadratic cells.
inline constexpr double mesh_cells = 1e6;

// The averaging radius, against the thinnest layer and the smallest defect:
// a disc wider than the film it averages in, or than the defect it looks
// at, averages the concentration away.
inline constexpr double averaging_radius_per_thinnest_layer = 1.0;
inline constexpr double averaging_radius_per_defect_size = 0.5;

// Material files (a case's `materials`): a Young's or initial shear modulus from
// 1 Pa (a soft gel is about 1 kPa) to 10 TPa (diamond is about 1 TPa); the
// bulk modulus up to 1e10 MPa, room for a nearly incompressible stiff
// solid; crack-onset and yield strains from 1e-6 to 10 (1,000 %).
inline constexpr double smallest_modulus_mpa = 1e-6;
inline constexpr double largest_modulus_mpa = 1e7;
inline constexpr double largest_bulk_modulus_mpa = 1e10;
inline constexpr double smallest_limit_strain = 1e-6;
inline constexpr double largest_limit_strain = 10.0;

// One line of the reference's "Limits" table.
struct LimitRow {
  std::string what;
  std::string limit;
  std::string why;
};

// Every limit above, in the order the reference lists them.
[[nodiscard]] std::vector<LimitRow> limit_rows();

}  // namespace plystrain::limits
