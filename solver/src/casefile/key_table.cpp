#include "plystrain/solver/key_table.hpp"

#include "plystrain/solver/case_limits.hpp"

#include <algorithm>
#include <charconv>
#include <sstream>

namespace plystrain {

std::string_view section_name(CaseSection section) {
  switch (section) {
    case CaseSection::top: return "";
    case CaseSection::geometry: return "geometry";
    case CaseSection::layer: return "layer";
    case CaseSection::defect: return "defect";
    case CaseSection::load: return "load";
    case CaseSection::mesh: return "mesh";
    case CaseSection::report: return "report";
    case CaseSection::variant: return "variant";
    case CaseSection::sweep: return "sweep";
  }
  return "";
}

namespace {

using S = CaseSection;
using V = ValueKind;
using U = UnitKind;

ValueBound above(double value) { return {value, true}; }
ValueBound at_least(double value) { return {value, false}; }
ValueBound below(double value) { return {value, true}; }
ValueBound at_most(double value) { return {value, false}; }

std::vector<KeyChoice> plain(std::initializer_list<std::string_view> names) {
  std::vector<KeyChoice> choices;
  for (std::string_view name : names) {
    choices.push_back({name, {}});
  }
  return choices;
}

// The averaging radius, with the limits that keep its meaning
// (case_limits.hpp; checked with the mesh, case_mesh_checks.cpp).
KeyInfo averaging_radius_key() {
  KeyInfo key;
  key.section = S::report;
  key.name = "averaging_radius";
  key.kind = V::length;
  key.default_text = "half the thinnest layer, at most half the smallest defect";
  key.min = at_least(0);
  key.unit = U::length;
  key.help =
      "strain is averaged over a disc of this radius (in the cross-section, within the same "
      "layer) before its peak is taken, so that a reported peak converges under mesh "
      "refinement; 0 reports the raw integration-point peak. At most the thickness of the "
      "thinnest layer and half the size of the smallest defect: a wider disc averages the "
      "concentration away. Where the raw peak would give another verdict, the run says so";
  return key;
}

std::vector<KeyInfo> build_table() {
  const KeyCondition strip_only{"geometry.shape", {"strip"}};
  std::vector<KeyInfo> keys;
  const auto add = [&keys](KeyInfo info) { keys.push_back(std::move(info)); };
  // The most elements an array key takes (case_limits.hpp), for the key just added.
  const auto items_at_most = [&keys](std::size_t count) { keys.back().max_items = count; };

  // Top level.
  add({.section = S::top, .name = "format", .kind = V::integer, .required = true,
       .default_text = "required", .min = at_least(1), .max = at_most(1), .settable = false,
       .help = "version of the case format; must be 1"});
  add({.section = S::top, .name = "title", .kind = V::text, .default_text = "the file name",
       .help = "shown in reports"});
  add({.section = S::top, .name = "units", .kind = V::choice, .fixed_default = CaseValue{std::string{"um"}},
       .default_text = "\"um\"", .choices = plain({"nm", "um", "mm", "m"}), .settable = false,
       .help = "length unit of every length in the file (converted to micrometres when read)"});
  add({.section = S::top, .name = "materials", .kind = V::paths,
       .fixed_default = CaseValue{std::vector<std::string>{}}, .default_text = "[]",
       .unit = U::path, .settable = false,
       .help = "extra material files, relative to the case file, merged over the built-in "
               "library (a later file wins)"});
  items_at_most(limits::material_files);

  // [geometry]
  add({.section = S::geometry, .name = "shape", .kind = V::choice, .required = true,
       .default_text = "required", .choices = plain({"strip", "disk"}),
       .help = "`strip`: a cross-section through a long stack (plane-strain family); `disk`: "
               "an axisymmetric cross-section about the axis r = 0"});
  add({.section = S::geometry,
       .name = "width",
       .kind = V::length,
       .default_text = "stretch, bend: wide enough to isolate the defects; conform: required",
       .min = above(0),
       .unit = U::length,
       .help = "extent along x or r of the modelled part: the half-width of a symmetric strip, "
               "the half-width of a full strip (modelled from -width to width), or the radius "
               "of a disk. Left out, it covers each defect's zone of influence twice over (a "
               "zone is the defect's reach plus three load-transfer lengths of the stack, at "
               "least three stack thicknesses), so that each defect is isolated; a width inside "
               "a zone models a row of defects at twice that spacing and gets a caution. "
               "Required for conform, where it is the device's radius"});
  add({.section = S::geometry,
       .name = "defect_spacing",
       .kind = V::length,
       .min = above(0),
       .unit = U::length,
       .applies_when = {strip_only},
       .help = "a row of equal defects at this spacing along x, stated on purpose (a row of "
               "cracks or slits): the modelled half-width is half the spacing. Not together "
               "with `width`"});
  add({.section = S::geometry, .name = "symmetric", .kind = V::boolean,
       .fixed_default = CaseValue{true}, .default_text = "true", .applies_when = {strip_only},
       .help = "`true`: a symmetry plane at x = 0 and only 0..width is modelled; `false`: "
               "-width..width with no symmetry plane (defects may sit on either side)"});

  // [[layer]]
  add({.section = S::layer, .name = "name", .kind = V::name, .required = true,
       .default_text = "required", .settable = false,
       .help = "unique name of the layer, [a-z0-9-]+"});
  add({.section = S::layer, .name = "role", .kind = V::choice, .required = true,
       .default_text = "required",
       .choices = plain({"substrate", "electrode", "active", "transport", "adhesive",
                         "encapsulant", "other"}),
       .help = "what the layer does in the device; used in reports and sweeps"});
  add({.section = S::layer, .name = "material", .kind = V::text, .required = true,
       .default_text = "required",
       .help = "a key of the material library (`plystrain materials` lists them)"});
  add({.section = S::layer, .name = "thickness", .kind = V::length, .required = true,
       .default_text = "required", .min = above(0), .unit = U::length,
       .help = "thickness of the layer (outside any cavity it fills)"});
  add({.section = S::layer, .name = "elements_through", .kind = V::integer,
       .default_text = "`mesh.elements_through`", .min = at_least(1), .max = at_most(100),
       .unit = U::count, .help = "minimum number of elements across this layer"});

  // [[defect]]
  const KeyCondition film_defect{"kind", {"pinhole", "slit", "thin-spot"}};
  add({.section = S::defect,
       .name = "kind",
       .kind = V::choice,
       .required = true,
       .default_text = "required",
       .choices = plain({"pinhole", "slit", "thin-spot", "delamination"}),
       .settable = false,
       .help = "`slit` (strip) and `pinhole` (disk): a hole through the whole thickness of its "
               "layer. On a strip, a plane-strain section, every defect runs across the whole "
               "device: a slit is a scratch or channel crack, a thin spot a groove, a "
               "delamination a band; round pinholes are modelled on disks (equibiaxial "
               "stretch). `thin-spot`: a recess in the top face of its layer; `delamination`: a "
               "stretch of interface that is not bonded (its faces may separate and slide but "
               "not pass through each other)"});
  add({.section = S::defect, .name = "layer", .kind = V::name, .required = true,
       .default_text = "required", .applies_when = {film_defect},
       .help = "name of the layer that has the defect"});
  add({.section = S::defect, .name = "below", .kind = V::name, .required = true,
       .default_text = "required", .applies_when = {{"kind", {"delamination"}}},
       .help = "name of the layer whose top face is the unbonded interface (not the top "
               "layer)"});
  add({.section = S::defect, .name = "at", .kind = V::length,
       .fixed_default = CaseValue{0.0}, .default_text = "0", .unit = U::length,
       .help = "centre of the defect along x or r. 0 is on the axis or symmetry plane (a "
               "circular defect on a disk, a mirrored one on a symmetric strip); on a disk "
               "at > 0 is a ring. Negative only on a strip with `symmetric = false`"});
  add({.section = S::defect, .name = "size", .kind = V::length, .required = true,
       .default_text = "required", .min = above(0), .unit = U::length,
       .help = "full width (strip) or diameter (disk); the defect must lie inside the "
               "modelled width and, when at != 0 on a symmetric strip or a disk, must not "
               "cross x = 0"});
  add({.section = S::defect, .name = "depth", .kind = V::number, .required = true,
       .default_text = "required", .min = above(0), .max = below(1), .unit = U::fraction,
       .applies_when = {{"kind", {"thin-spot"}}},
       .help = "share of the layer's thickness that is missing"});
  add({.section = S::defect, .name = "taper", .kind = V::length,
       .fixed_default = CaseValue{0.0}, .default_text = "0", .min = at_least(0),
       .unit = U::length, .applies_when = {{"kind", {"thin-spot"}}},
       .help = "width of the sloped edge of a thin spot, at most half its size (0 = a step)"});
  add({.section = S::defect, .name = "fill", .kind = V::choice,
       .default_text = "\"above\" (\"void\" in the top layer, which has nothing above it)",
       .choices = plain({"above", "void"}), .applies_when = {film_defect},
       .help = "`above`: the layer above flows into the cavity and keeps a flat top (its "
               "thickness is measured outside the cavity); `void`: the cavity stays empty and "
               "the layers above bridge it"});

  // [load]
  const KeyCondition conform{"kind", {"conform"}};
  add({.section = S::load, .name = "kind", .kind = V::choice, .required = true,
       .default_text = "required",
       .choices = {{"stretch", {}}, {"bend", {"strip"}}, {"conform", {"disk"}}},
       .help = "`stretch`: a nominal strain through the outer edge; `bend`: bending to a "
               "radius (strip only); `conform`: laying the stack onto a rigid surface of "
               "revolution (disk only)"});
  add({.section = S::load, .name = "strain", .kind = V::number, .required = true,
       .default_text = "required", .min = above(-1), .max = at_most(10), .unit = U::fraction,
       .applies_when = {{"kind", {"stretch"}}},
       .help = "nominal strain applied along x (strip) or equibiaxially in the plane (disk), "
               "through the outer edge"});
  add({.section = S::load, .name = "lateral", .kind = V::choice_or_number,
       .default_text = "\"free\" for stretch, \"held\" for bend", .min = above(-1),
       .max = at_most(10), .choices = plain({"free", "held"}), .unit = U::fraction,
       .applies_when = {{"kind", {"stretch", "bend"}}, strip_only},
       .help = "the third direction: `free` = no net force across it (a stretched strip "
               "narrows), `held` = no strain (plane strain; a wide plate bends so), a number = "
               "that nominal strain imposed (equal to `strain` for equibiaxial)"});
  add({.section = S::load, .name = "radius", .kind = V::lengths, .required = true,
       .default_text = "required", .unit = U::length, .applies_when = {{"kind", {"bend"}}},
       .help = "bending radius of the stack's neutral plane, or an array of radii run one "
               "after another (e.g. [5000, -5000]); positive: the top of the stack is on the "
               "convex side; |radius| must exceed the stack thickness"});
  items_at_most(limits::bend_radii);
  add({.section = S::load, .name = "surface", .kind = V::choice, .required = true,
       .default_text = "required", .choices = plain({"sphere", "ellipsoid", "profile"}),
       .applies_when = {conform},
       .help = "rigid target surface of revolution, apex on the axis"});
  add({.section = S::load, .name = "surface_radius", .kind = V::length, .required = true,
       .default_text = "required", .min = above(0), .unit = U::length,
       .applies_when = {conform, {"surface", {"sphere"}}}, .help = "radius of the sphere"});
  add({.section = S::load, .name = "semi_axes", .kind = V::length_pair, .required = true,
       .default_text = "required", .min = above(0), .unit = U::length,
       .applies_when = {conform, {"surface", {"ellipsoid"}}},
       .help = "[in-plane, height] semi-axes of the ellipsoid"});
  add({.section = S::load, .name = "points", .kind = V::points, .required = true,
       .default_text = "required", .unit = U::length,
       .applies_when = {conform, {"surface", {"profile"}}},
       .help = "surface height as [r, z] pairs: at least two, r starting at 0 and "
               "increasing, z not increasing"});
  items_at_most(limits::profile_points);
  add({.section = S::load, .name = "method", .kind = V::choice,
       .fixed_default = CaseValue{std::string{"wrap"}}, .default_text = "\"wrap\"",
       .choices = plain({"wrap", "press"}), .applies_when = {conform},
       .help = "`wrap`: the bottom face is laid onto the surface and slides on it without "
               "friction, the edge is free (the surface must be long enough to take the "
               "whole width); `press`: the rim is held in a ring and the surface is pushed "
               "through it"});
  add({.section = S::load, .name = "ring", .kind = V::length,
       .default_text = "`geometry.width`", .min = above(0), .unit = U::length,
       .applies_when = {conform, {"method", {"press"}}},
       .help = "radius at which the rim is held; at most the width, and within the surface"});
  add({.section = S::load, .name = "travel", .kind = V::length, .required = true,
       .default_text = "required", .min = above(0), .unit = U::length,
       .applies_when = {conform, {"method", {"press"}}},
       .help = "the apex starts touching the centre of the bottom face (the ring plane) and "
               "is pushed up by this much"});
  add({.section = S::load, .name = "contact", .kind = V::choice,
       .fixed_default = CaseValue{std::string{"frictionless"}}, .default_text = "\"frictionless\"",
       .choices = plain({"frictionless", "bonded"}),
       .applies_when = {conform, {"method", {"press"}}},
       .help = "`bonded`: a point that touches the surface sticks to it"});
  add({.section = S::load, .name = "local", .kind = V::boolean,
       .default_text = "true when the case has defects", .applies_when = {conform},
       .help = "after the global solve, analyse each defect in a local cell loaded with the "
               "in-plane strain state found at the most strained point (or at `local_at`)"});
  add({.section = S::load, .name = "local_at", .kind = V::length,
       .default_text = "the most strained point", .min = at_least(0), .unit = U::length,
       .applies_when = {conform}, .help = "where to take that strain state, at most the width"});
  add({.section = S::load, .name = "steps", .kind = V::integer,
       .fixed_default = CaseValue{std::int64_t{10}}, .default_text = "10", .min = at_least(1),
       .max = at_most(100000), .unit = U::count,
       .help = "first number of load increments; failed increments are halved and grown "
               "again when they pass"});
  add({.section = S::load, .name = "max_steps", .kind = V::integer,
       .fixed_default = CaseValue{std::int64_t{200}}, .default_text = "200", .min = at_least(1),
       .max = at_most(1000000), .unit = U::count,
       .help = "the run stops with a clear message past this many increments (at least "
               "`steps`)"});

  // [mesh]
  add({.section = S::mesh, .name = "size_near", .kind = V::length,
       .default_text = "thinnest layer / 2, at most `size_far`", .min = above(0), .unit = U::length,
       .help = "element size at defects and at the most strained region (at most `size_far`)"});
  add({.section = S::mesh, .name = "size_far", .kind = V::length, .default_text = "width / 40, at least `size_near`",
       .min = above(0), .unit = U::length,
       .help = "element size far from defects (also the largest size along thin layers)"});
  add({.section = S::mesh, .name = "grade_over", .kind = V::length,
       .default_text = "10 * size_far", .min = above(0), .unit = U::length,
       .help = "distance over which the size grows from near to far"});
  add({.section = S::mesh, .name = "elements_through", .kind = V::integer,
       .fixed_default = CaseValue{std::int64_t{3}}, .default_text = "3", .min = at_least(1),
       .max = at_most(100), .unit = U::count,
       .help = "default minimum number of elements across each layer"});
  add({.section = S::mesh, .name = "order", .kind = V::integer,
       .fixed_default = CaseValue{std::int64_t{2}}, .default_text = "2", .min = at_least(1),
       .max = at_most(2), .unit = U::count, .help = "polynomial order of the elements, 1 or 2"});

  // [report]
  add({.section = S::report, .name = "out", .kind = V::text,
       .default_text = "`<case name>-out` beside the case", .unit = U::path,
       .help = "output directory, relative to the case file; the case name is the file "
               "name without extension, or the folder name for a file called case.toml. "
               "Variants and sweep runs write into a sub-directory named after them"});
  add(averaging_radius_key());
  add({.section = S::report, .name = "fields", .kind = V::boolean,
       .fixed_default = CaseValue{true}, .default_text = "true",
       .help = "write ParaView files (a .vtu per converged increment and one .pvd)"});
  add({.section = S::report, .name = "profiles", .kind = V::boolean,
       .fixed_default = CaseValue{true}, .default_text = "true",
       .help = "write the strain along each layer's mid-line to CSV"});
  add({.section = S::report,
       .name = "verify",
       .kind = V::boolean,
       .fixed_default = CaseValue{false},
       .default_text = "false",
       .help = "after the run, solve the case again with the mesh halved (size_near and size_far), and "
               "(stretch and bend, unless a defect spacing is stated) with the width doubled, "
               "and report how far each layer's peak moved (as `--verify`)"});

  // [[variant]]
  add({.section = S::variant, .name = "name", .kind = V::name, .required = true,
       .default_text = "required", .settable = false,
       .help = "unique name of the variant, [a-z0-9-]+"});
  add({.section = S::variant, .name = "remove", .kind = V::names,
       .fixed_default = CaseValue{std::vector<std::string>{}}, .default_text = "[]",
       .settable = false,
       .help = "layers left out; a defect in a removed layer, and a delamination whose "
               "interface loses either face, is left out with it"});
  items_at_most(limits::layers);
  add({.section = S::variant, .name = "set", .kind = V::table, .default_text = "{}",
       .settable = false,
       .help = "changes as `\"path\" = value`, applied before `remove`; paths: "
               "`layer.<name>.<key>`, `defect.<index from 1>.<key>`, `geometry.<key>`, "
               "`load.<key>`, `mesh.<key>`, `report.<key>`, `title`"});
  items_at_most(limits::changes_per_variant);

  // [sweep]
  add({.section = S::sweep, .name = "parameter", .kind = V::text, .required = true,
       .default_text = "required", .settable = false,
       .help = "the dotted path to vary, as in a variant's `set`"});
  add({.section = S::sweep, .name = "values", .kind = V::values,
       .default_text = "required unless `from`, `to`, `count`", .settable = false,
       .help = "the values, each checked like the key it sets"});
  items_at_most(limits::sweep_values);
  add({.section = S::sweep, .name = "from", .kind = V::number, .default_text = "none",
       .settable = false, .help = "first value of a linear range (with `to` and `count`)"});
  add({.section = S::sweep, .name = "to", .kind = V::number, .default_text = "none",
       .settable = false, .help = "last value of a linear range"});
  add({.section = S::sweep, .name = "count", .kind = V::integer, .default_text = "none",
       .min = at_least(2), .max = at_most(1000), .unit = U::count, .settable = false,
       .help = "number of values of a linear range, ends included"});
  keys.back().max = at_most(static_cast<double>(limits::sweep_values));  // as many as `values`
  return keys;
}

std::string number_text(double value) {
  char buffer[64];
  const auto result = std::to_chars(buffer, buffer + sizeof buffer, value);
  return std::string(buffer, result.ptr);
}

}  // namespace

const std::vector<KeyInfo>& case_key_table() {
  static const std::vector<KeyInfo> table = build_table();
  return table;
}

const KeyInfo* find_case_key(CaseSection section, std::string_view name) {
  for (const KeyInfo& key : case_key_table()) {
    if (key.section == section && key.name == name) {
      return &key;
    }
  }
  return nullptr;
}

std::vector<std::string> case_key_names(CaseSection section) {
  std::vector<std::string> names;
  for (const KeyInfo& key : case_key_table()) {
    if (key.section == section) {
      names.emplace_back(key.name);
    }
  }
  return names;
}

std::string KeyInfo::path() const {
  const std::string_view prefix = section_name(section);
  return prefix.empty() ? std::string(name) : std::string(prefix) + "." + std::string(name);
}

bool KeyInfo::allows_choice(std::string_view choice) const {
  return std::any_of(choices.begin(), choices.end(),
                     [choice](const KeyChoice& known) { return known.name == choice; });
}

namespace {

std::string bounds_text(const KeyInfo& key) {
  std::string text;
  if (key.min && key.max && key.min->value == key.max->value) {
    return " = " + number_text(key.min->value);
  }
  if (key.min) {
    text += (key.min->open ? " > " : " >= ") + number_text(key.min->value);
  }
  if (key.max) {
    text += std::string(key.min ? "," : "") + (key.max->open ? " < " : " <= ") +
            number_text(key.max->value);
  }
  return text;
}

std::string choices_text(const KeyInfo& key) {
  std::string text;
  for (std::size_t i = 0; i < key.choices.size(); ++i) {
    if (i > 0) {
      text += (i + 1 == key.choices.size()) ? " or " : ", ";
    }
    text += '"';
    text += key.choices[i].name;
    text += '"';
  }
  return text;
}

}  // namespace

std::string KeyInfo::type_text() const {
  const std::string bounds = bounds_text(*this);
  switch (kind) {
    case V::integer: return "integer" + bounds;
    case V::number: return (unit == U::fraction ? "fraction" : "number") + bounds;
    case V::length: return "length" + bounds;
    case V::lengths: return "length or array of lengths" + bounds;
    case V::length_pair: return "[length, length]" + (bounds.empty() ? "" : ", each" + bounds);
    case V::points: return "array of [r, z] lengths";
    case V::boolean: return "true or false";
    case V::choice: return choices_text(*this);
    case V::choice_or_number: return choices_text(*this) + " or a fraction" + bounds;
    case V::name: return "name [a-z0-9-]+";
    case V::text: return "string";
    case V::paths: return "array of paths";
    case V::names: return "array of layer names";
    case V::table: return "table of path = value";
    case V::values: return "array";
  }
  return "";
}

std::string KeyInfo::applies_text() const {
  if (applies_when.empty()) {
    return "all";
  }
  std::string text;
  for (const KeyCondition& condition : applies_when) {
    if (!text.empty()) {
      text += "; ";
    }
    if (condition.key != "kind") {
      text += std::string(condition.key) + " = ";
    }
    for (std::size_t i = 0; i < condition.values.size(); ++i) {
      text += (i > 0 ? ", " : "") + std::string(condition.values[i]);
    }
  }
  return text;
}

}  // namespace plystrain
