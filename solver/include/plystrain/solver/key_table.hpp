// The declared keys of the case format, version 1. This one table drives the
// reader's validation (types, ranges, choices, which keys apply to which load
// kind or shape), its error messages, `set`/`[sweep]` type checks and the
// generated reference docs/case-format-reference.md.
#pragma once

#include "plystrain/solver/case_spec.hpp"

#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace plystrain {

enum class CaseSection { top, geometry, layer, defect, load, mesh, report, variant, sweep };

// The TOML name of a section ("" for the top level, "layer", ...).
[[nodiscard]] std::string_view section_name(CaseSection section);

enum class ValueKind {
  integer,            // TOML integer
  number,             // integer or float, finite
  length,             // a number in the case's unit
  lengths,            // a length or an array of lengths (kept as an array)
  length_pair,        // [a, b] lengths
  points,             // array of [r, z] lengths
  boolean,
  choice,             // one string of `choices`
  choice_or_number,   // one string of `choices`, or a number
  name,               // string of [a-z0-9-]+
  text,               // any string
  paths,              // array of strings
  names,              // array of names
  table,              // a table of dotted paths (variant `set`)
  values,             // an array of values of the swept key
};

enum class UnitKind { none, length, fraction, count, path };

struct ValueBound {
  double value = 0.0;
  bool open = false;  // true: the bound itself is not allowed
};

struct KeyChoice {
  std::string_view name;
  std::vector<std::string_view> shapes;  // geometry shapes it is allowed on; empty: all
};

// The key applies only when `key` has one of `values`. `key` is a sibling in
// the same table ("kind", "surface", "method") or "geometry.shape".
struct KeyCondition {
  std::string_view key;
  std::vector<std::string_view> values;
};

struct KeyInfo {
  CaseSection section = CaseSection::top;
  std::string_view name{};
  ValueKind kind = ValueKind::text;
  bool required = false;              // required wherever it applies
  std::optional<CaseValue> fixed_default{};  // a constant default; derived defaults are computed by the reader
  std::string_view default_text{};    // the default as the reference shows it
  std::optional<ValueBound> min{};    // for numbers, each element of arrays too
  std::optional<ValueBound> max{};
  std::size_t max_items = 0;  // arrays: most elements allowed (0: no limit of its own)
  std::vector<KeyChoice> choices{};
  UnitKind unit = UnitKind::none;
  std::vector<KeyCondition> applies_when{};  // all must hold; empty: always applies
  bool settable = true;               // may be changed by a variant `set` or a sweep
  std::string_view help{};

  [[nodiscard]] std::string path() const;              // "load.strain", "units"
  [[nodiscard]] std::string type_text() const;          // "length > 0", "\"free\", \"held\" or a fraction"
  [[nodiscard]] std::string applies_text() const;       // "stretch, bend; strip" or "all"
  [[nodiscard]] bool allows_choice(std::string_view choice) const;
};

// All keys, in the order the reference lists them.
[[nodiscard]] const std::vector<KeyInfo>& case_key_table();

// The key `name` of `section`, or nullptr.
[[nodiscard]] const KeyInfo* find_case_key(CaseSection section, std::string_view name);

// The names of the keys of `section`, in table order (for "did you mean" hints).
[[nodiscard]] std::vector<std::string> case_key_names(CaseSection section);

// The reference page docs/case-format-reference.md, rendered from the table.
[[nodiscard]] std::string render_case_format_reference();

}  // namespace plystrain
