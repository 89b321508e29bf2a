// Renders the declared key table as the Markdown reference page. The page is
// generated, never edited by hand: a test compares it with this output.
#include "plystrain/solver/key_table.hpp"

#include "plystrain/solver/case_limits.hpp"

#include <sstream>

namespace plystrain {

namespace {

// Markdown table cells may not hold a bare '|'.
std::string cell(std::string_view text) {
  std::string escaped;
  for (char c : text) {
    if (c == '|') {
      escaped += "\\|";
    } else {
      escaped += c;
    }
  }
  return escaped;
}

std::string unit_text(const KeyInfo& key) {
  switch (key.unit) {
    case UnitKind::length: return "`units`";
    case UnitKind::fraction: return "fraction";
    case UnitKind::count: return "count";
    case UnitKind::path: return "path";
    case UnitKind::none: return "";
  }
  return "";
}

std::string choice_notes(const KeyInfo& key) {
  std::string notes;
  for (const KeyChoice& choice : key.choices) {
    if (choice.shapes.empty()) {
      continue;
    }
    notes += " `" + std::string(choice.name) + "` only on ";
    for (std::size_t i = 0; i < choice.shapes.size(); ++i) {
      notes += (i > 0 ? ", " : "") + std::string(choice.shapes[i]);
    }
    notes += ".";
  }
  return notes;
}

std::string item_note(const KeyInfo& key) {
  return key.max_items == 0 ? "" : " At most " + std::to_string(key.max_items) + ".";
}

void render_limits(std::ostringstream& page) {
  page << "## Limits\n\n"
       << "A case past any of these is refused by `check` (and so by every command) with\n"
       << "`file:line:column`, the key and the limit. They keep a mistaken or hostile\n"
       << "file from crashing, hanging or flooding the reader, and `check` from passing\n"
       << "a case the mesher or the solver cannot honour. Messages escape control\n"
       << "characters (`\\u001B`), shorten long values to their first 60 characters\n"
       << "and a count, and list at most 5 errors of one kind and 20 in all, then say how\n"
       << "many more there are.\n\n"
       << "| what | limit | why |\n"
       << "|---|---|---|\n";
  for (const limits::LimitRow& row : limits::limit_rows()) {
    page << "| " << cell(row.what) << " | " << cell(row.limit) << " | " << cell(row.why) << " |\n";
  }
  page << "\n";
}

void render_section(std::ostringstream& page, CaseSection section, std::string_view heading,
                    std::string_view intro) {
  page << "## " << heading << "\n\n";
  if (!intro.empty()) {
    page << intro << "\n\n";
  }
  page << "| key | type | default | unit | applies to | settable | meaning |\n";
  page << "|---|---|---|---|---|---|---|\n";
  for (const KeyInfo& key : case_key_table()) {
    if (key.section != section) {
      continue;
    }
    page << "| `" << key.name << "` | " << cell(key.type_text()) << " | "
         << cell(key.required ? "required" : key.default_text) << " | " << unit_text(key) << " | "
         << cell(key.applies_text()) << " | " << (key.settable ? "yes" : "no") << " | "
         << cell(std::string(key.help) + "." + choice_notes(key) + item_note(key)) << " |\n";
  }
  page << "\n";
}

}  // namespace

std::string render_case_format_reference() {
  std::ostringstream page;
  page << "# Case format reference, version 1\n\n"
       << "Generated from the declared key table (solver/src/casefile/key_table.cpp); do not\n"
       << "edit by hand. Regenerate with `plystrain reference > docs/case-format-reference.md`\n"
       << "or `plystrain_tests_casefile \"[.regenerate]\"`; a test fails when it is stale.\n\n"
       << "Conventions\n"
       << "- Lengths are in the unit named by `units` (`nm`, `um`, `mm`, `m`) and are\n"
       << "  converted to micrometres once, when the case is read. Strains are nominal\n"
       << "  strains given as fractions (0.2 = 20 %); moduli are in MPa.\n"
       << "- Integers are accepted wherever a number or a length is expected.\n"
       << "- Unknown keys are errors, with the closest known key as a hint. Every error\n"
       << "  reads `file:line:column: key path: what was expected, what was found`.\n"
       << "- A key that does not apply to the chosen load kind, surface, method, defect\n"
       << "  kind or shape (column \"applies to\") is an error; a key marked required is\n"
       << "  required only where it applies.\n"
       << "- The stack is listed bottom to top; `z = 0` is the bottom of the lowest layer.\n"
       << "- \"settable\" keys may be changed by a variant's `set` or by `[sweep]`.\n\n";
  render_section(page, CaseSection::top, "Top level", "");
  render_section(page, CaseSection::geometry, "`[geometry]` (required)", "");
  render_section(page, CaseSection::layer, "`[[layer]]` (one or more, bottom to top)",
                 "Neighbouring layers are perfectly bonded unless a `delamination` defect "
                 "says otherwise. Layer names are unique.");
  render_section(page, CaseSection::defect, "`[[defect]]` (zero or more)",
                 "Defects of the same kind in the same layer (or at the same interface) may "
                 "not overlap; defects of different kinds may (a thin spot over a delaminated "
                 "patch is a common case). On a symmetric strip a defect at `at = 0` is "
                 "mirrored by the symmetry plane; on a disk it is circular.");
  render_section(page, CaseSection::load, "`[load]` (required)",
                 "`kind = \"bend\"` needs a strip and `kind = \"conform\"` a disk.");
  render_section(page, CaseSection::mesh, "`[mesh]`", "");
  render_section(page, CaseSection::report, "`[report]`", "");
  render_section(page, CaseSection::variant, "`[[variant]]` (zero or more)",
                 "A variant is the base case with a few changes; each is read back through "
                 "the same checks as the base case. A `set` value is checked against the "
                 "key it sets; errors point at the `set` line. A path must end in a key (a "
                 "nested table of no key is an error) of a layer or defect the variant keeps. "
                 "When a `set` changes a key "
                 "that decides which others apply (for example `load.kind`), base keys that "
                 "no longer apply are dropped and the variant must set the keys the new "
                 "choice requires. Defect indices count from 1 in the base case.");
  render_section(page, CaseSection::sweep, "`[sweep]` (optional)",
                 "A sweep runs the base case once per value of one settable key. Give "
                 "either `values` or all of `from`, `to` and `count` (numbers and lengths "
                 "only).");
  render_limits(page);
  page << "## Example\n\n"
       << "See `cases/*/case.toml`; every example case is checked by the tests.\n";
  return page.str();
}

}  // namespace plystrain
