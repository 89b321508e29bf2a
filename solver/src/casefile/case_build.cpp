// CaseDocument to CaseSpec: which keys apply, required keys, defaults, unit
// conversion to micrometres.
#include "case_document.hpp"
#include "plystrain/solver/case_limits.hpp"
#include "plystrain/solver/input_text.hpp"
#include "plystrain/solver/zone_of_influence.hpp"

#include <algorithm>
#include <cmath>

namespace plystrain::casefile {

namespace {

std::string condition_text(const KeyInfo& key, const Table& table, const CaseDocument& document) {
  for (const KeyCondition& condition : key.applies_when) {
    const std::string* value = condition.key == "geometry.shape" ? document.geometry.text("shape")
                                                                  : table.text(condition.key);
    std::string found = value != nullptr ? "\"" + *value + "\"" : "its default";
    if (value == nullptr) {
      const KeyInfo* decider = find_case_key(key.section, condition.key);
      if (decider != nullptr && decider->fixed_default) {
        found = case_value_text(*decider->fixed_default) + " (the default)";
      }
    }
    if (value == nullptr || std::find(condition.values.begin(), condition.values.end(), *value) ==
                                condition.values.end()) {
      std::string wanted;
      for (std::size_t i = 0; i < condition.values.size(); ++i) {
        wanted += (i > 0 ? (i + 1 == condition.values.size() ? " or " : ", ") : "") +
                  std::string("\"") + std::string(condition.values[i]) + "\"";
      }
      const std::string decider = condition.key == "geometry.shape"
                                      ? "geometry.shape"
                                      : std::string(condition.key);
      return "applies only when " + decider + " is " + wanted + ", found " + found;
    }
  }
  return "does not apply here";
}

// Keys that do not apply, required keys that are missing, choices that need another shape.
void check_table_keys(const Table& table, CaseSection section, const std::string& label,
                      const CaseDocument& document, Problems& problems) {
  for (const KeyInfo& key : case_key_table()) {
    if (key.section != section) {
      continue;
    }
    const std::string path = label.empty() ? std::string(key.name)
                                           : label + "." + std::string(key.name);
    const Entry* entry = table.find(key.name);
    const Applies applies = key_applies(key, table, document);
    if (entry != nullptr && applies == Applies::no) {
      problems.add(entry->where, path, "key does not apply: it " +
                                           condition_text(key, table, document));
    } else if (entry == nullptr && key.required && applies == Applies::yes) {
      problems.add(table.where, path, "required key \"" + std::string(key.name) + "\" is missing");
    }
    if (entry != nullptr && !key.choices.empty()) {
      const std::string* choice = std::get_if<std::string>(&entry->value);
      const std::string* shape = document.geometry.text("shape");
      for (const KeyChoice& known : key.choices) {
        if (choice != nullptr && shape != nullptr && known.name == *choice &&
            !known.shapes.empty() &&
            std::find(known.shapes.begin(), known.shapes.end(), *shape) == known.shapes.end()) {
          problems.add(entry->where, path,
                       "\"" + *choice + "\" needs geometry.shape = \"" +
                           std::string(known.shapes.front()) + "\", found \"" + *shape + "\"");
        }
      }
    }
  }
}

template <class Enum, std::size_t N>
Enum enum_from(const std::string& text, const std::array<std::pair<const char*, Enum>, N>& names) {
  for (const auto& [name, value] : names) {
    if (text == name) {
      return value;
    }
  }
  return names.front().second;  // unreachable: choices were checked when the file was read
}

constexpr std::array<std::pair<const char*, LengthUnit>, 4> unit_names{
    {{"um", LengthUnit::um}, {"nm", LengthUnit::nm}, {"mm", LengthUnit::mm}, {"m", LengthUnit::m}}};
constexpr std::array<std::pair<const char*, Shape>, 2> shape_names{
    {{"strip", Shape::strip}, {"disk", Shape::disk}}};
constexpr std::array<std::pair<const char*, LayerRole>, 7> role_names{
    {{"other", LayerRole::other},
     {"substrate", LayerRole::substrate},
     {"electrode", LayerRole::electrode},
     {"active", LayerRole::active},
     {"transport", LayerRole::transport},
     {"adhesive", LayerRole::adhesive},
     {"encapsulant", LayerRole::encapsulant}}};
constexpr std::array<std::pair<const char*, DefectKind>, 4> defect_names{
    {{"pinhole", DefectKind::pinhole},
     {"slit", DefectKind::pinhole},
     {"thin-spot", DefectKind::thin_spot},
     {"delamination", DefectKind::delamination}}};
constexpr std::array<std::pair<const char*, DefectFill>, 2> fill_names{
    {{"above", DefectFill::above}, {"void", DefectFill::empty}}};
constexpr std::array<std::pair<const char*, LoadKind>, 3> load_names{
    {{"stretch", LoadKind::stretch}, {"bend", LoadKind::bend}, {"conform", LoadKind::conform}}};
constexpr std::array<std::pair<const char*, SurfaceKind>, 3> surface_names{
    {{"sphere", SurfaceKind::sphere},
     {"ellipsoid", SurfaceKind::ellipsoid},
     {"profile", SurfaceKind::profile}}};
constexpr std::array<std::pair<const char*, ConformMethod>, 2> method_names{
    {{"wrap", ConformMethod::wrap}, {"press", ConformMethod::press}}};
constexpr std::array<std::pair<const char*, ContactKind>, 2> contact_names{
    {{"frictionless", ContactKind::frictionless}, {"bonded", ContactKind::bonded}}};

// Reads typed values out of one table, with the key table's constant
// defaults, converting lengths to micrometres.
class TableReader {
 public:
  TableReader(const Table& table, CaseSection section, double micrometres)
      : table_(table), section_(section), micrometres_(micrometres) {}

  // The entry, or the key's constant default (given = false).
  template <class T>
  Located<T> raw(std::string_view name, T fallback) const {
    if (const Entry* entry = table_.find(name)) {
      return {std::get<T>(entry->value), entry->where, true};
    }
    const KeyInfo* key = find_case_key(section_, name);
    if (key != nullptr && key->fixed_default) {
      if (const T* value = std::get_if<T>(&*key->fixed_default)) {
        return {*value, table_.where, false};
      }
    }
    return {std::move(fallback), table_.where, false};
  }

  Located<double> length(std::string_view name, double fallback_um = 0.0) const {
    Located<double> value = raw<double>(name, fallback_um / micrometres_);
    value.value *= micrometres_;
    return value;
  }
  Located<double> number(std::string_view name, double fallback = 0.0) const {
    return raw<double>(name, fallback);
  }
  Located<int> integer(std::string_view name, int fallback = 0) const {
    const Located<std::int64_t> value = raw<std::int64_t>(name, fallback);
    return {static_cast<int>(value.value), value.where, value.given};
  }
  Located<bool> boolean(std::string_view name, bool fallback = false) const {
    return raw<bool>(name, fallback);
  }
  Located<std::string> text(std::string_view name) const { return raw<std::string>(name, {}); }

  template <class Enum, std::size_t N>
  Located<Enum> choice(std::string_view name,
                       const std::array<std::pair<const char*, Enum>, N>& names) const {
    const Located<std::string> value = raw<std::string>(name, names.front().first);
    return {enum_from(value.value, names), value.where, value.given};
  }

  [[nodiscard]] bool has(std::string_view name) const { return table_.find(name) != nullptr; }
  [[nodiscard]] const Entry* entry(std::string_view name) const { return table_.find(name); }

 private:
  const Table& table_;
  CaseSection section_;
  double micrometres_;
};

// A through-layer hole is a different defect in the two geometries, and the
// case must say which one it means: in a plane-strain section the hole runs
// along the whole depth of the device (a slit, scratch or channel crack),
// which concentrates strain far more than a round pinhole of the same width.
void check_hole_spelling(const Located<std::string>& kind, Shape shape, std::size_t index,
                         Problems& problems) {
  const std::string key = CaseDocument::defect_label(index) + ".kind";
  if (shape == Shape::strip && kind.value == "pinhole") {
    problems.add(kind.where, key,
                 "a through-layer hole on a strip is a line defect across the whole device (a "
                 "plane-strain section cannot hold a round hole): write kind = \"slit\" for a "
                 "slit, scratch or channel crack; for a round pinhole under equibiaxial stretch "
                 "use geometry.shape = \"disk\", found \"pinhole\"");
  } else if (shape == Shape::disk && kind.value == "slit") {
    problems.add(kind.where, key,
                 "a disk is axisymmetric, so a hole through a layer is a round \"pinhole\" (a "
                 "ring when at > 0); a slit across the device needs geometry.shape = \"strip\", "
                 "found \"slit\"");
  }
}

// An empty name would be the case's own folder, and the operating system
// reads a name only up to a NUL character, so the run would go elsewhere.
bool usable_folder_name(const Located<std::string>& out, Problems& problems) {
  if (out.value.empty()) {
    problems.add(out.where, "report.out", "expected the name of an output folder, found \"\"");
    return false;
  }
  if (out.value.find('\0') != std::string::npos) {
    problems.add(out.where, "report.out",
                 "expected the name of an output folder, found a name with a NUL character "
                 "(\\u0000) in it");
    return false;
  }
  return true;
}

// The numbers of a length entry, as written (lengths, pairs and points alike).
std::vector<double> length_numbers(const CaseValue& value) {
  if (const auto* number = std::get_if<double>(&value)) {
    return {*number};
  }
  if (const auto* numbers = std::get_if<std::vector<double>>(&value)) {
    return *numbers;
  }
  std::vector<double> flat;
  if (const auto* points = std::get_if<std::vector<std::array<double, 2>>>(&value)) {
    for (const std::array<double, 2>& point : *points) {
      flat.insert(flat.end(), point.begin(), point.end());
    }
  }
  return flat;
}

// Why `micrometres` (a length as converted) is no length of a real device,
// or "" when it is one. Zero passes only when it was written as zero (and
// the key allows it): a denormal number becomes zero when converted.
std::string length_range_problem(double as_written, double micrometres, LengthUnit unit,
                                 const KeyInfo& key) {
  const double size = std::abs(micrometres);
  const bool zero = as_written == 0.0;
  if (std::isfinite(micrometres) && size <= limits::largest_length_um &&
      (zero || size >= limits::smallest_length_um)) {
    return "";
  }
  std::string found = float_text(as_written) + " " + unit_name(unit);
  if (unit != LengthUnit::um) {
    found += ", which is " + float_text(micrometres) + " um";
  }
  if (!std::isfinite(micrometres) || size > limits::largest_length_um) {
    return "expected a length of at most " + float_text(limits::largest_length_um) +
           " um (10 m), found " + found;
  }
  const bool zero_allowed = !key.min || key.min->value < 0.0 || !key.min->open;
  return std::string("expected ") + (zero_allowed ? "0 or " : "") + "a length of at least " +
         float_text(limits::smallest_length_um) + " um (0.1 nm), found " + found;
}

// Every length of the document, checked after conversion: a value can be in
// range as written and infinite, zero or denormal in micrometres.
void check_length_ranges(const CaseDocument& document, double micrometres, LengthUnit unit,
                         Problems& problems) {
  const auto check_table = [&](const Table& table, CaseSection section, const std::string& label) {
    for (const auto& [name, entry] : table.entries) {
      const KeyInfo* key = find_case_key(section, name);
      if (key == nullptr || key->unit != UnitKind::length) {
        continue;
      }
      for (const double number : length_numbers(entry.value)) {
        const std::string problem = length_range_problem(number, number * micrometres, unit, *key);
        if (!problem.empty()) {
          problems.add(entry.where, label.empty() ? name : label + "." + name, problem);
          break;
        }
      }
    }
  };
  check_table(document.geometry, CaseSection::geometry, "geometry");
  for (std::size_t i = 0; i < document.layers.size(); ++i) {
    check_table(document.layers[i], CaseSection::layer, document.layer_label(i));
  }
  for (std::size_t i = 0; i < document.defects.size(); ++i) {
    check_table(document.defects[i], CaseSection::defect, CaseDocument::defect_label(i));
  }
  check_table(document.load, CaseSection::load, "load");
  check_table(document.mesh, CaseSection::mesh, "mesh");
  check_table(document.report, CaseSection::report, "report");
}

// Half the thinnest layer, and at most half the smallest defect, so that the
// default never averages a defect away (case_limits.hpp).
double default_averaging_radius(const CaseSpec& spec) {
  double radius = spec.thinnest_thickness() / 2.0;
  for (const DefectSpec& defect : spec.defects) {
    radius = std::min(radius, limits::averaging_radius_per_defect_size * defect.size.value);
  }
  return radius;
}

}  // namespace

CaseSpec build_case(const CaseDocument& document, const MaterialLibrary& library) {
  Problems problems;
  const SourceLocation& start = document.top.where;
  if (!document.geometry.present) {
    problems.add(start, "geometry", "required table [geometry] is missing");
  }
  if (document.layers.empty()) {
    problems.add(start, "layer", "at least one [[layer]] is required");
  }
  if (!document.load.present) {
    problems.add(start, "load", "required table [load] is missing");
  }
  check_table_keys(document.top, CaseSection::top, "", document, problems);
  if (document.geometry.present) {
    check_table_keys(document.geometry, CaseSection::geometry, "geometry", document, problems);
  }
  for (std::size_t i = 0; i < document.layers.size(); ++i) {
    check_table_keys(document.layers[i], CaseSection::layer, document.layer_label(i), document,
                     problems);
  }
  for (std::size_t i = 0; i < document.defects.size(); ++i) {
    check_table_keys(document.defects[i], CaseSection::defect, CaseDocument::defect_label(i),
                     document, problems);
  }
  if (document.load.present) {
    check_table_keys(document.load, CaseSection::load, "load", document, problems);
  }
  check_table_keys(document.mesh, CaseSection::mesh, "mesh", document, problems);
  check_table_keys(document.report, CaseSection::report, "report", document, problems);
  problems.throw_if_any();

  CaseSpec spec;
  spec.source = document.source;
  spec.library = library;
  const TableReader top(document.top, CaseSection::top, 1.0);
  spec.format = top.integer("format");
  spec.title = top.text("title");
  if (!spec.title.given) {
    // The file's name stands in: reports print it, so it is escaped.
    spec.title.value = escape_control_characters(document.source.filename().string());
  }
  spec.units = top.choice("units", unit_names);
  const double micrometres = micrometres_per(spec.units.value);
  check_length_ranges(document, micrometres, spec.units.value, problems);
  problems.throw_if_any();
  if (const Entry* files = document.top.find("materials")) {
    for (const std::string& file : std::get<std::vector<std::string>>(files->value)) {
      spec.material_files.push_back({file, files->where, true});
    }
  }

  const TableReader geometry(document.geometry, CaseSection::geometry, micrometres);
  spec.geometry.where = document.geometry.where;
  spec.geometry.shape = geometry.choice("shape", shape_names);
  spec.geometry.symmetric = geometry.boolean("symmetric");

  const TableReader mesh(document.mesh, CaseSection::mesh, micrometres);
  spec.mesh.where = document.mesh.where;
  spec.mesh.elements_through = mesh.integer("elements_through");
  spec.mesh.order = mesh.integer("order");

  for (const Table& table : document.layers) {
    const TableReader reader(table, CaseSection::layer, micrometres);
    LayerSpec layer;
    layer.where = table.where;
    layer.name = reader.text("name");
    layer.role = reader.choice("role", role_names);
    layer.material = reader.text("material");
    layer.thickness = reader.length("thickness");
    layer.elements_through = reader.integer("elements_through", spec.mesh.elements_through.value);
    spec.layers.push_back(std::move(layer));
  }
  const double thinnest = spec.thinnest_thickness();

  for (std::size_t i = 0; i < document.defects.size(); ++i) {
    const Table& table = document.defects[i];
    const TableReader reader(table, CaseSection::defect, micrometres);
    DefectSpec defect;
    defect.where = table.where;
    defect.kind = reader.choice("kind", defect_names);
    check_hole_spelling(reader.text("kind"), spec.geometry.shape.value, i, problems);
    defect.layer = reader.text("layer");
    defect.below = reader.text("below");
    defect.at = reader.length("at");
    defect.size = reader.length("size");
    defect.depth = reader.number("depth");
    defect.taper = reader.length("taper");
    defect.fill = reader.choice("fill", fill_names);
    // A defect in the top layer has nothing above it to fill the cavity.
    if (!defect.fill.given && !spec.layers.empty() &&
        defect.layer.value == spec.layers.back().name.value) {
      defect.fill.value = DefectFill::empty;
    }
    spec.defects.push_back(std::move(defect));
  }

  // The width defaults to one that isolates the defects (zone_of_influence.hpp);
  // a stated defect spacing models a row of defects instead.
  const StackScales scales = stack_scales(spec.layers, spec.library);
  spec.geometry.defect_spacing = geometry.length("defect_spacing");
  const double width_default = spec.geometry.defect_spacing.given
                                   ? 0.5 * spec.geometry.defect_spacing.value
                                   : default_width(spec.defects, scales);
  spec.geometry.width = geometry.length("width", width_default);
  if (spec.geometry.defect_spacing.given) {
    spec.geometry.width.where = spec.geometry.defect_spacing.where;
  }

  // Filled defaults never contradict each other: size_near <= size_far.
  spec.mesh.size_near = mesh.length("size_near", thinnest / 2.0);
  spec.mesh.size_far = mesh.length("size_far", spec.geometry.width.value / 40.0);
  if (!spec.mesh.size_near.given) {
    spec.mesh.size_near.value = std::min(spec.mesh.size_near.value, spec.mesh.size_far.value);
  } else if (!spec.mesh.size_far.given) {
    spec.mesh.size_far.value = std::max(spec.mesh.size_far.value, spec.mesh.size_near.value);
  }
  spec.mesh.grade_over = mesh.length("grade_over", 10.0 * spec.mesh.size_far.value);

  const TableReader load(document.load, CaseSection::load, micrometres);
  LoadSpec& l = spec.load;
  l.where = document.load.where;
  l.kind = load.choice("kind", load_names);
  l.strain = load.number("strain");
  if (const Entry* lateral = load.entry("lateral")) {
    LateralCondition condition;
    if (const auto* text = std::get_if<std::string>(&lateral->value)) {
      condition.mode = *text == "held" ? LateralMode::held : LateralMode::free;
    } else {
      condition.mode = LateralMode::imposed;
      condition.strain = std::get<double>(lateral->value);
    }
    l.lateral = {condition, lateral->where, true};
  } else {
    const LateralMode mode = l.kind.value == LoadKind::bend ? LateralMode::held : LateralMode::free;
    l.lateral = {LateralCondition{mode, 0.0}, document.load.where, false};
  }
  const Located<std::vector<double>> radius = load.raw<std::vector<double>>("radius", {});
  l.radius = radius;
  for (double& value : l.radius.value) {
    value *= micrometres;
  }
  l.surface = load.choice("surface", surface_names);
  l.surface_radius = load.length("surface_radius");
  const Located<std::vector<double>> axes = load.raw<std::vector<double>>("semi_axes", {});
  l.semi_axes = {{0.0, 0.0}, axes.where, axes.given};
  if (axes.value.size() == 2) {
    l.semi_axes.value = {axes.value[0] * micrometres, axes.value[1] * micrometres};
  }
  l.points = load.raw<std::vector<std::array<double, 2>>>("points", {});
  for (std::array<double, 2>& point : l.points.value) {
    point = {point[0] * micrometres, point[1] * micrometres};
  }
  l.method = load.choice("method", method_names);
  l.ring = load.length("ring", spec.geometry.width.value);
  l.travel = load.length("travel");
  l.contact = load.choice("contact", contact_names);
  l.local = load.boolean("local", !spec.defects.empty());
  if (const Entry* local_at = load.entry("local_at")) {
    l.local_at = {std::get<double>(local_at->value) * micrometres, local_at->where, true};
  } else {
    l.local_at = {std::nullopt, document.load.where, false};
  }
  l.steps = load.integer("steps");
  l.max_steps = load.integer("max_steps");

  const TableReader report(document.report, CaseSection::report, micrometres);
  spec.report.where = document.report.where;
  const Located<std::string> out = report.text("out");
  const std::filesystem::path case_folder = document.source.parent_path();
  if (out.given && usable_folder_name(out, problems)) {
    spec.report.out = {std::filesystem::absolute(case_folder / out.value).lexically_normal(),
                       out.where, true};
  } else {
    spec.report.out = {
        std::filesystem::absolute(case_folder / (spec.name() + "-out")).lexically_normal(),
        document.report.where, false};
  }
  spec.report.averaging_radius = report.length("averaging_radius", default_averaging_radius(spec));
  spec.report.fields = report.boolean("fields");
  spec.report.profiles = report.boolean("profiles");
  spec.report.verify = report.boolean("verify");

  spec.variants = document.variants;
  spec.sweep = document.sweep;

  check_case(spec, problems);
  problems.throw_if_any();
  check_mesher_accepts(spec, problems);
  problems.throw_if_any();
  return spec;
}

}  // namespace plystrain::casefile
