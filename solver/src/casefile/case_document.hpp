// Internal: a case as a set of tables of checked key = value entries, with
// lengths still in the case's unit. It sits between the TOML text and
// CaseSpec in both directions:
//   TOML --parse_case_document--> CaseDocument --build_case--> CaseSpec
//   CaseSpec --document_from_case--> CaseDocument --render_case_document--> TOML
// Variants and sweeps edit a CaseDocument and build it again, so every
// variant passes the same checks as the base case.
#pragma once

#include "plystrain/solver/case_spec.hpp"
#include "plystrain/solver/key_table.hpp"

#include <filesystem>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace plystrain::casefile {

struct Entry {
  CaseValue value;
  SourceLocation where;
  bool is_default = false;   // filled by document_from_case for display only
  bool from_change = false;  // set by a variant or sweep
};

struct Table {
  TableLocation where;
  bool present = false;
  std::map<std::string, Entry, std::less<>> entries;

  [[nodiscard]] const Entry* find(std::string_view key) const;
  [[nodiscard]] const std::string* text(std::string_view key) const;  // a string entry
};

struct CaseDocument {
  std::filesystem::path source;
  Table top, geometry, load, mesh, report;
  std::vector<Table> layers, defects;
  std::vector<VariantSpec> variants;
  std::optional<SweepSpec> sweep;

  // The key path prefix of layer `index` (0-based): "layer.<name>" or "layer[3]".
  [[nodiscard]] std::string layer_label(std::size_t index) const;
  [[nodiscard]] static std::string defect_label(std::size_t index);  // "defect[2]"
};

// Collects problems; at least the first one must be exact. A hostile file
// can hold a million mistakes: of each kind only the first few are kept (the
// rest counted on the last one kept), and only so many kinds.
class Problems {
 public:
  void add(SourceLocation where, std::string key_path, std::string message);
  [[nodiscard]] bool empty() const { return list_.empty() && not_kept_ == 0; }
  void throw_if_any() const;

 private:
  struct Tally {
    std::size_t kept = 0;
    std::size_t last = 0;  // index in list_ of the last one kept
  };
  std::vector<InputProblem> list_;
  std::map<std::string, Tally, std::less<>> kinds_;
  std::size_t not_kept_ = 0;
};

// Whether `key` applies in `table` of `document`: yes, no, or unknown (a
// deciding key is missing or wrong, which is reported on its own).
enum class Applies { yes, no, unknown };
[[nodiscard]] Applies key_applies(const KeyInfo& key, const Table& table,
                                  const CaseDocument& document);

// Whether `text` is a name of the case format: [a-z0-9-]+.
[[nodiscard]] bool is_case_name(std::string_view text);

// Checks a value already of the key's TOML type against its range and
// choices. Returns an empty string when it is fine, else "expected ..., found ...".
[[nodiscard]] std::string check_value(const CaseValue& value, const KeyInfo& key);

// A `set` or sweep path resolved against the document.
struct ChangeTarget {
  CaseSection section = CaseSection::top;
  std::size_t index = 0;  // layer or defect index, 0-based
  const KeyInfo* key = nullptr;
};
// Resolves `path`; on failure returns nullopt and sets `problem`.
[[nodiscard]] std::optional<ChangeTarget> resolve_change_path(const std::string& path,
                                                              const CaseDocument& document,
                                                              std::string& problem);
[[nodiscard]] Table& target_table(CaseDocument& document, const ChangeTarget& target);

// What makes `text` unfit to be parsed at all: too large, empty, not UTF-8
// text, or nested deeper than the parser can safely follow.
[[nodiscard]] std::optional<InputProblem> text_problem(std::string_view text,
                                                       const std::filesystem::path& file);

// TOML text to document: syntax, unknown keys, types, ranges, choices. Throws InputError.
[[nodiscard]] CaseDocument parse_case_document(std::string_view text,
                                               const std::filesystem::path& file);

// Document to CaseSpec: which keys apply, required keys, defaults, unit
// conversion and the checks that need the whole case. Throws InputError.
[[nodiscard]] CaseSpec build_case(const CaseDocument& document, const MaterialLibrary& library);

// CaseSpec to document, lengths in the case's unit. With `with_defaults`
// the filled defaults are included (marked is_default) for display. Without
// `with_studies` the variants and the sweep are left out (a variant's own
// document needs neither, and copying them into each would make resolving
// every variant quadratic in their number).
[[nodiscard]] CaseDocument document_from_case(const CaseSpec& spec, bool with_defaults,
                                              bool with_studies = true);

// The document as TOML; entries marked is_default are written as comments.
[[nodiscard]] std::string render_case_document(const CaseDocument& document);

// The value in TOML spelling.
[[nodiscard]] std::string value_text(const CaseValue& value);

// Shortest text that reads back as the same double, always with a '.' or an exponent.
[[nodiscard]] std::string float_text(double value);

// The cross checks that need the whole case (names, materials, geometry).
void check_case(const CaseSpec& spec, Problems& problems);

// The checks that make a case the mesher can honour (case_limits.hpp):
// smallest features, the size of the mesh, the averaging radius, and the
// mesher's own validation of the stack. For a case that passed check_case.
void check_mesher_accepts(const CaseSpec& spec, Problems& problems);

}  // namespace plystrain::casefile
