#include "plystrain/solver/case_limits.hpp"

#include "plystrain/solver/input_text.hpp"

#include <charconv>

namespace plystrain::limits {

namespace {

std::string count(std::size_t value) {
  return grouped_count(value);
}

std::string number(double value) {
  char buffer[32];
  const auto result = std::to_chars(buffer, buffer + sizeof buffer, value);
  return std::string(buffer, result.ptr);
}

}  // namespace

std::vector<LimitRow> limit_rows() {
  return {
      {"size of the case file (and of each material file)",
       count(case_file_bytes) + " bytes (1 MiB)",
       "the largest example case is a few kilobytes; a profile of 10,000 points fits"},
      {"nesting of tables, dotted keys, arrays and inline tables", count(nesting_depth) + " levels",
       "the deepest the format needs is a variant `set` written as nested tables (eight); the TOML "
       "parser recurses once per level"},
      {"a layer or variant name", count(name_characters) + " characters",
       "names head the columns of the reports"},
      {"any other string (title, material, paths, `set` paths)",
       count(text_characters) + " characters, no control characters",
       "strings are shown in reports and messages; a control character would act on the "
       "terminal"},
      {"`[[layer]]` tables", count(layers), "each layer adds cells through the stack"},
      {"`[[defect]]` tables", count(defects), "each defect adds columns of cells"},
      {"`[[variant]]` tables", count(variants), "`compare` solves every variant in full"},
      {"changes in one variant's `set`", count(changes_per_variant),
       "a variant is a few changes to the base case"},
      {"sweep values (`values`, or `count`)", count(sweep_values),
       "`run` solves every value in full"},
      {"bend radii", count(bend_radii), "each radius is a solve of its own"},
      {"profile points", count(profile_points), "finer than any measured profile needs"},
      {"material files", count(material_files), "each file is read and merged in turn"},
      {"any length, after conversion to micrometres",
       "at most " + number(largest_length_um) + " um (10 m); other than 0, at least " +
           number(smallest_length_um) + " um (0.1 nm)",
       "a length past these is a mistake of unit or exponent (1e308 m is infinite, 5e-324 nm "
       "is zero in micrometres)"},
      {"smallest feature: a layer, a defect's size, a taper, a thin spot's recess and what is "
       "left under it, the gap between two distinct defect edges",
       number(smallest_feature_ratio) +
           " of the model's extent (the larger of the modelled span and the stack thickness), "
           "and at least 0.1 nm",
       "past it the cells along the film are more than 10^4 times longer than thick, and the "
       "geometry kernel merges points closer than its tolerance"},
      {"cells of the mesh, estimated from the stack and the mesh sizes (with `report.verify` or "
       "`--verify`, also of the convergence check's reruns: the mesh halved has about four times "
       "the cells)",
       count(static_cast<std::size_t>(mesh_cells)),
       "about 8 million unknowns with quadratic cells, past the memory of a workstation"},
      {"material files: Young's or initial shear modulus; bulk modulus",
       number(smallest_modulus_mpa) + " to " + number(largest_modulus_mpa) + " MPa; " +
           number(smallest_modulus_mpa) + " to " + number(largest_bulk_modulus_mpa) + " MPa",
       "1 Pa to 10 TPa spans every solid; a denormal or astronomical modulus is a typing "
       "mistake that the solver would turn into nonsense"},
      {"material files: crack-onset and yield strains",
       number(smallest_limit_strain) + " to " + number(largest_limit_strain),
       "fractions: 10 is 1,000 %"},
      {"`report.averaging_radius`",
       "at most the thinnest layer's thickness and half the smallest defect's size",
       "a wider disc averages the concentration away"},
  };
}

}  // namespace plystrain::limits
