// The case as read: plain value types for version 1 of the case format
// (docs/case-format-reference.md). Every user value keeps the place it came
// from so that later stages (the mesher, the solver) can name file:line when
// they find a problem the reader could not see.
//
// Internal units: lengths in micrometres (converted once, when reading; the
// user's unit is kept for display and for writing the case back), strains as
// fractions, moduli in MPa.
#pragma once

#include "plystrain/solver/input_error.hpp"
#include "plystrain/solver/material_library.hpp"

#include <array>
#include <cstdint>
#include <filesystem>
#include <optional>
#include <string>
#include <variant>
#include <vector>

namespace plystrain {

// A value and where it came from. `given` is false when the reader filled a
// documented default (then `where` is the enclosing table, or empty).
// Equality compares values and `given` only: the same case read from two
// files is the same case.
template <class T>
struct Located {
  T value{};
  SourceLocation where;
  bool given = false;

  bool operator==(const Located& other) const {
    return value == other.value && given == other.given;
  }
};

enum class LengthUnit { nm, um, mm, m };
enum class Shape { strip, disk };
enum class LayerRole { substrate, electrode, active, transport, adhesive, encapsulant, other };
enum class DefectKind { pinhole, thin_spot, delamination };
enum class DefectFill { above, empty };  // "above", "void"
enum class LoadKind { stretch, bend, conform };
enum class LateralMode { free, held, imposed };
enum class SurfaceKind { sphere, ellipsoid, profile };
enum class ConformMethod { wrap, press };
enum class ContactKind { frictionless, bonded };

// Case-file spellings ("um", "thin-spot", "void", ...).
[[nodiscard]] const char* unit_name(LengthUnit unit);
[[nodiscard]] const char* shape_name(Shape shape);
[[nodiscard]] const char* role_name(LayerRole role);
// A hole through a layer is spelt by what it is in the modelled geometry: on
// a strip (a plane-strain section) it runs across the whole device, a
// "slit"; on a disk it is a round "pinhole" (or a ring when off the axis).
[[nodiscard]] const char* defect_kind_name(DefectKind kind, Shape shape);
[[nodiscard]] const char* fill_name(DefectFill fill);
[[nodiscard]] const char* load_kind_name(LoadKind kind);
[[nodiscard]] const char* surface_name(SurfaceKind kind);
[[nodiscard]] const char* method_name(ConformMethod method);
[[nodiscard]] const char* contact_name(ContactKind kind);

// Where a table ([geometry], one [[layer]], ...) starts. It takes no part in
// equality, like the locations inside Located.
struct TableLocation : SourceLocation {
  bool operator==(const TableLocation& /*other*/) const { return true; }
};

// Micrometres per one `unit`.
[[nodiscard]] double micrometres_per(LengthUnit unit);

struct GeometrySpec {
  TableLocation where;  // the [geometry] header
  Located<Shape> shape;
  Located<double> width;           // um; when not given, chosen to isolate the defects
  Located<double> defect_spacing;  // um; given: a row of defects, width = spacing / 2
  Located<bool> symmetric;

  bool operator==(const GeometrySpec& other) const = default;
};

struct LayerSpec {
  TableLocation where;  // the [[layer]] header
  Located<std::string> name;
  Located<LayerRole> role;
  Located<std::string> material;  // a key of the material library
  Located<double> thickness;      // um
  Located<int> elements_through;  // default: mesh.elements_through

  bool operator==(const LayerSpec& other) const = default;
};

struct DefectSpec {
  TableLocation where;  // the [[defect]] header
  Located<DefectKind> kind;
  Located<std::string> layer;  // pinhole, thin-spot: the layer with the defect
  Located<std::string> below;  // delamination: the interface is the top face of this layer
  Located<double> at;          // um, centre along x or r
  Located<double> size;        // um, full width or diameter
  Located<double> depth;       // thin-spot: share of the thickness that is missing
  Located<double> taper;       // um, thin-spot: width of the sloped edge
  Located<DefectFill> fill;    // pinhole, thin-spot

  // The layer the defect belongs to: `layer`, or `below` for a delamination.
  [[nodiscard]] const Located<std::string>& host_layer() const {
    return kind.value == DefectKind::delamination ? below : layer;
  }
  bool operator==(const DefectSpec& other) const = default;
};

struct LateralCondition {
  LateralMode mode = LateralMode::free;
  double strain = 0.0;  // imposed nominal strain (mode == imposed)
  bool operator==(const LateralCondition& other) const = default;
};

struct LoadSpec {
  TableLocation where;  // the [load] header
  Located<LoadKind> kind;
  Located<double> strain;                               // stretch
  Located<LateralCondition> lateral;                    // stretch, bend on a strip
  Located<std::vector<double>> radius;                  // bend, um (one or more)
  Located<SurfaceKind> surface;                         // conform
  Located<double> surface_radius;                       // sphere, um
  Located<std::array<double, 2>> semi_axes;             // ellipsoid, um: in-plane, height
  Located<std::vector<std::array<double, 2>>> points;   // profile, um: [r, z]
  Located<ConformMethod> method;                        // conform
  Located<double> ring;                                 // press, um
  Located<double> travel;                               // press, um
  Located<ContactKind> contact;                         // press
  Located<bool> local;                                  // conform
  Located<std::optional<double>> local_at;              // conform, um; empty: most strained point
  Located<int> steps;
  Located<int> max_steps;

  bool operator==(const LoadSpec& other) const = default;
};

struct MeshSpec {
  TableLocation where;
  Located<double> size_near;   // um
  Located<double> size_far;    // um
  Located<double> grade_over;  // um
  Located<int> elements_through;
  Located<int> order;

  bool operator==(const MeshSpec& other) const = default;
};

struct ReportSpec {
  TableLocation where;
  Located<std::filesystem::path> out;  // absolute or relative to the working directory
  Located<double> averaging_radius;    // um
  Located<bool> fields;
  Located<bool> profiles;
  Located<bool> verify;  // rerun with a finer mesh and a wider cell, report how the peaks moved

  bool operator==(const ReportSpec& other) const = default;
};

// A value as written in a case file (lengths in the case's unit), used by
// `set` and `[sweep]`. Arrays of lengths, [r, z] points and name lists are
// kept whole.
using CaseValue = std::variant<bool, std::int64_t, double, std::string, std::vector<double>,
                               std::vector<std::array<double, 2>>, std::vector<std::string>>;

// "3.5", "\"gold\"", "[1, 2]", ... (TOML spelling).
[[nodiscard]] std::string case_value_text(const CaseValue& value);

struct SetChange {
  std::string path;  // "layer.<name>.<key>", "defect.<index from 1>.<key>", "load.<key>", ...
  CaseValue value;   // already checked against the key's type and range
  SourceLocation where;
  bool operator==(const SetChange& other) const {
    return path == other.path && value == other.value;
  }
};

struct VariantSpec {
  TableLocation where;
  Located<std::string> name;
  std::vector<Located<std::string>> remove;  // layer names
  std::vector<SetChange> set;
  bool operator==(const VariantSpec& other) const = default;
};

struct SweepRange {
  double from = 0.0;
  double to = 0.0;
  int count = 0;
  bool operator==(const SweepRange& other) const = default;
};

struct SweepSpec {
  TableLocation where;
  Located<std::string> parameter;
  std::vector<SetChange> values;    // one change of `parameter` per run, in order
  std::optional<SweepRange> range;  // set when the values came from `from`, `to`, `count`
  bool operator==(const SweepSpec& other) const = default;
};

struct CaseSpec {
  std::filesystem::path source;  // the case file (empty for a case built in code)
  Located<int> format;
  Located<std::string> title;
  Located<LengthUnit> units;
  std::vector<Located<std::string>> material_files;  // as written, relative to the case file
  GeometrySpec geometry;
  std::vector<LayerSpec> layers;  // bottom to top
  std::vector<DefectSpec> defects;
  LoadSpec load;
  MeshSpec mesh;
  ReportSpec report;
  std::vector<VariantSpec> variants;
  std::optional<SweepSpec> sweep;
  MaterialLibrary library;  // the library the case was checked against

  [[nodiscard]] const LayerSpec* find_layer(std::string_view name) const;
  [[nodiscard]] double total_thickness() const;      // um
  [[nodiscard]] double thinnest_thickness() const;   // um (0 when there is no layer)
  // The case's name: the file name without extension, or the folder's name
  // for a file called case.toml.
  [[nodiscard]] std::string name() const;

  // Every value and `given` flag (locations and the library are not compared).
  bool operator==(const CaseSpec& other) const;
};

}  // namespace plystrain
