// TOML text to CaseDocument. The only toml++ user of the case reader: every
// key is looked up in the declared key table, converted to its CaseValue and
// checked against its range and choices here.
#include "case_document.hpp"

#include "plystrain/solver/case_limits.hpp"
#include "plystrain/solver/input_text.hpp"
#include "plystrain/solver/text_distance.hpp"
#include "plystrain/solver/toml_text_check.hpp"

#include <toml++/toml.h>

#include <cmath>

namespace plystrain::casefile {

namespace {

SourceLocation location_of(const toml::source_region& region, const std::filesystem::path& file) {
  return SourceLocation{file.string(), static_cast<int>(region.begin.line),
                        static_cast<int>(region.begin.column)};
}

// "a string \"abc\"", "an integer 3", "a table", ...
std::string describe(const toml::node& node) {
  switch (node.type()) {
    case toml::node_type::string:
      return "the string " + quoted_echo(node.as_string()->get());
    case toml::node_type::integer: return "the integer " + std::to_string(node.as_integer()->get());
    case toml::node_type::floating_point: return "the number " + float_text(node.as_floating_point()->get());
    case toml::node_type::boolean: return node.as_boolean()->get() ? "true" : "false";
    case toml::node_type::table: return "a table";
    case toml::node_type::array: return "an array";
    case toml::node_type::date: return "a date";
    case toml::node_type::time: return "a time";
    case toml::node_type::date_time: return "a date-time";
    case toml::node_type::none: return "nothing";
  }
  return "a value";
}

std::optional<double> number_of(const toml::node& node) {
  if (const auto* integer = node.as_integer()) {
    return static_cast<double>(integer->get());
  }
  if (const auto* floating = node.as_floating_point()) {
    return floating->get();
  }
  return std::nullopt;
}

// The name a [[layer]] or [[variant]] table gives itself, when it is one the
// key paths of its messages can show; otherwise nothing (the name's own
// problem is reported on its line).
std::optional<std::string> usable_name(const toml::table& table) {
  const toml::node* name = table.get("name");
  if (name == nullptr || !name->is_string()) {
    return std::nullopt;
  }
  const std::string& text = name->as_string()->get();
  if (!is_case_name(text) || text.size() > limits::name_characters) {
    return std::nullopt;
  }
  return text;
}

// A node read as a value of a key's kind: the value, or what was expected.
struct Converted {
  std::optional<CaseValue> value;
  std::string expected;
};

Converted expected(std::string what) { return {std::nullopt, std::move(what)}; }

std::optional<double> finite_number(const toml::node& element) {
  const std::optional<double> number = number_of(element);
  return (number && std::isfinite(*number)) ? number : std::nullopt;
}

Converted converted_lengths(const toml::node& node, const KeyInfo& info) {
  std::vector<double> numbers;
  if (const toml::array* array = node.as_array()) {
    for (const toml::node& element : *array) {
      const std::optional<double> number = finite_number(element);
      if (!number) {
        return expected("an array of lengths (numbers)");
      }
      numbers.push_back(*number);
    }
  } else if (info.kind == ValueKind::lengths) {
    const std::optional<double> number = finite_number(node);
    if (!number) {
      return expected("a length or an array of lengths");
    }
    numbers.push_back(*number);
  }
  if (info.kind == ValueKind::length_pair && numbers.size() != 2) {
    return expected("an array of two lengths");
  }
  if (numbers.empty()) {
    return expected("at least one length");
  }
  return {CaseValue{numbers}, {}};
}

Converted converted_points(const toml::node& node) {
  std::vector<std::array<double, 2>> points;
  const toml::array* array = node.as_array();
  if (array == nullptr) {
    return expected("an array of [r, z] pairs");
  }
  for (const toml::node& element : *array) {
    const toml::array* pair = element.as_array();
    if (pair == nullptr || pair->size() != 2 || !finite_number(*pair->get(0)) || !finite_number(*pair->get(1))) {
      return expected("an array of [r, z] pairs of numbers");
    }
    points.push_back({*finite_number(*pair->get(0)), *finite_number(*pair->get(1))});
  }
  return {CaseValue{points}, {}};
}

Converted converted_texts(const toml::node& node, const KeyInfo& info) {
  std::vector<std::string> texts;
  const toml::array* array = node.as_array();
  if (array == nullptr) {
    return expected(info.type_text());
  }
  for (const toml::node& element : *array) {
    if (!element.is_string()) {
      return expected(info.type_text());
    }
    texts.push_back(element.as_string()->get());
  }
  return {CaseValue{texts}, {}};
}

Converted converted_value(const toml::node& node, const KeyInfo& info) {
  switch (info.kind) {
    case ValueKind::integer:
      return node.is_integer() ? Converted{CaseValue{node.as_integer()->get()}, {}} : expected("an integer");
    case ValueKind::number:
    case ValueKind::length:
      if (const std::optional<double> number = finite_number(node)) {
        return {CaseValue{*number}, {}};
      }
      return expected(info.kind == ValueKind::length ? "a finite length (a number)" : "a finite number");
    case ValueKind::lengths:
    case ValueKind::length_pair:
      return converted_lengths(node, info);
    case ValueKind::points:
      return converted_points(node);
    case ValueKind::boolean:
      return node.is_boolean() ? Converted{CaseValue{node.as_boolean()->get()}, {}} : expected("true or false");
    case ValueKind::choice:
      return node.is_string() ? Converted{CaseValue{node.as_string()->get()}, {}} : expected(info.type_text());
    case ValueKind::choice_or_number:
      if (node.is_string()) {
        return {CaseValue{node.as_string()->get()}, {}};
      }
      if (const std::optional<double> number = finite_number(node)) {
        return {CaseValue{*number}, {}};
      }
      return expected(info.type_text());
    case ValueKind::name:
    case ValueKind::text:
      if (node.is_string()) {
        return {CaseValue{node.as_string()->get()}, {}};
      }
      return expected(info.kind == ValueKind::name ? "a name (a string of a-z, 0-9 and -)" : "a string");
    case ValueKind::paths:
    case ValueKind::names:
      return converted_texts(node, info);
    case ValueKind::table:
    case ValueKind::values:
      break;
  }
  return expected("a value this key cannot take");
}

class DocumentParser {
 public:
  explicit DocumentParser(std::filesystem::path file) : file_(std::move(file)) {}

  CaseDocument parse(const toml::table& root) {
    document_.source = file_;
    document_.top.present = true;
    static_cast<SourceLocation&>(document_.top.where) = SourceLocation{file_.string(), 1, 1};
    const std::vector<std::string> top_names = top_level_names();
    for (auto&& [key, node] : root) {
      const std::string name(key.str());
      const SourceLocation where = location_of(key.source(), file_);
      if (name == "geometry" || name == "load" || name == "mesh" || name == "report") {
        const CaseSection section = name == "geometry" ? CaseSection::geometry
                                    : name == "load"   ? CaseSection::load
                                    : name == "mesh"   ? CaseSection::mesh
                                                       : CaseSection::report;
        if (const toml::table* table = node.as_table()) {
          read_table(*table, section, name, table_of(section));
        } else {
          problems_.add(where, name, "expected a table [" + name + "], found " + describe(node));
        }
      } else if (name == "layer" || name == "defect" || name == "variant") {
        read_table_array(node, name, where);
      } else if (name == "sweep") {
        if (const toml::table* table = node.as_table()) {
          read_sweep(*table);
        } else {
          problems_.add(where, name, "expected a table [sweep], found " + describe(node));
        }
      } else if (const KeyInfo* info = find_case_key(CaseSection::top, name)) {
        read_entry(node, *info, name, document_.top);
      } else {
        unknown_key(where, "", name, top_names, "the top level");
      }
    }
    // Problems about a table the file does not have still name the file.
    for (Table* table : {&document_.geometry, &document_.load, &document_.mesh, &document_.report}) {
      if (!table->present) {
        static_cast<SourceLocation&>(table->where) = SourceLocation{file_.string(), 0, 0};
      }
    }
    // Variants and sweeps name layers and defects: read them once those are known.
    for (const auto& [table, where] : pending_variants_) {
      read_variant(*table, where);
    }
    if (pending_sweep_ != nullptr) {
      read_sweep_values(*pending_sweep_);
    }
    problems_.throw_if_any();
    return document_;
  }

 private:
  std::filesystem::path file_;
  CaseDocument document_;
  Problems problems_;
  std::vector<std::pair<const toml::table*, SourceLocation>> pending_variants_;
  const toml::table* pending_sweep_ = nullptr;

  static std::vector<std::string> top_level_names() {
    std::vector<std::string> names = case_key_names(CaseSection::top);
    for (const char* section : {"geometry", "layer", "defect", "load", "mesh", "report",
                                "variant", "sweep"}) {
      names.emplace_back(section);
    }
    return names;
  }

  Table& table_of(CaseSection section) {
    switch (section) {
      case CaseSection::geometry: return document_.geometry;
      case CaseSection::load: return document_.load;
      case CaseSection::mesh: return document_.mesh;
      case CaseSection::report: return document_.report;
      default: return document_.top;
    }
  }

  // `name` as written in the file; `label` is the key path of its table.
  void unknown_key(const SourceLocation& where, const std::string& label, const std::string& name,
                   const std::vector<std::string>& known, std::string_view place) {
    const std::string path = label.empty() ? echoed(name) : label + "." + echoed(name);
    std::string message = "unknown key " + quoted_echo(name) + " in " + std::string(place);
    const std::string hint = closest_match(name, known);
    if (!hint.empty()) {
      message += " (did you mean \"" + hint + "\"?)";
    }
    problems_.add(where, path, message);
  }

  void read_table(const toml::table& table, CaseSection section, const std::string& label,
                  Table& target) {
    target.present = true;
    static_cast<SourceLocation&>(target.where) = location_of(table.source(), file_);
    const std::vector<std::string> known = case_key_names(section);
    for (auto&& [key, node] : table) {
      const std::string name(key.str());
      if (const KeyInfo* info = find_case_key(section, name)) {
        read_entry(node, *info, label + "." + name, target);
      } else {
        const bool repeated = section == CaseSection::layer || section == CaseSection::defect;
        const std::string table_name(section_name(section));
        unknown_key(location_of(key.source(), file_), label, name, known,
                    repeated ? "[[" + table_name + "]]" : "[" + table_name + "]");
      }
    }
  }

  void read_table_array(const toml::node& node, const std::string& name,
                        const SourceLocation& where) {
    const toml::array* array = node.as_array();
    if (array == nullptr || !array->is_array_of_tables()) {
      problems_.add(where, name,
                    "expected one or more tables [[" + name + "]], found " + describe(node));
      return;
    }
    const std::size_t most = name == "layer"    ? limits::layers
                             : name == "defect" ? limits::defects
                                                : limits::variants;
    if (array->size() > most) {
      // Only the first are read: checking the rest would take time in
      // proportion to a flood of them.
      problems_.add(location_of(array->get(most)->source(), file_), name,
                    "expected at most " + grouped_count(most) + " [[" + name + "]] tables, found " +
                        grouped_count(array->size()) + " (this is the first past the limit)");
    }
    for (std::size_t i = 0; i < std::min(array->size(), most); ++i) {
      const toml::table& table = *array->get(i)->as_table();
      if (name == "variant") {
        pending_variants_.emplace_back(&table, location_of(table.source(), file_));
        continue;
      }
      const bool is_layer = name == "layer";
      std::vector<Table>& tables = is_layer ? document_.layers : document_.defects;
      tables.emplace_back();
      std::string label = CaseDocument::defect_label(i);
      if (is_layer) {
        // Name the layer in key paths when its name is readable.
        const std::optional<std::string> layer_name = usable_name(table);
        label = layer_name ? "layer." + *layer_name : "layer[" + std::to_string(i + 1) + "]";
      }
      read_table(table, is_layer ? CaseSection::layer : CaseSection::defect, label,
                 tables.back());
    }
  }

  void read_entry(const toml::node& node, const KeyInfo& info, const std::string& path,
                  Table& target) {
    std::string problem;
    std::optional<CaseValue> value = convert(node, info, problem);
    const SourceLocation where = location_of(node.source(), file_);
    if (!value) {
      problems_.add(where, path, problem);
      return;
    }
    target.entries[std::string(info.name)] = Entry{std::move(*value), where};
  }

  // The node as a value of the key's kind, checked; or nullopt with `problem` set.
  static std::optional<CaseValue> convert(const toml::node& node, const KeyInfo& info,
                                          std::string& problem) {
    Converted converted = converted_value(node, info);
    if (!converted.value) {
      problem = "expected " + converted.expected + ", found " + describe(node);
      return std::nullopt;
    }
    problem = check_value(*converted.value, info);
    if (!problem.empty()) {
      return std::nullopt;
    }
    return converted.value;
  }

  void read_variant(const toml::table& table, const SourceLocation& where) {
    VariantSpec variant;
    static_cast<SourceLocation&>(variant.where) = where;
    const std::size_t number = document_.variants.size() + 1;
    std::string label = "variant[" + std::to_string(number) + "]";
    if (const std::optional<std::string> name = usable_name(table)) {
      label = "variant." + *name;
    }
    const std::vector<std::string> known = case_key_names(CaseSection::variant);
    bool has_name = false;
    for (auto&& [key, node] : table) {
      const std::string name(key.str());
      const std::string path = label + "." + name;
      const SourceLocation node_where = location_of(node.source(), file_);
      const KeyInfo* info = find_case_key(CaseSection::variant, name);
      if (info == nullptr) {
        unknown_key(location_of(key.source(), file_), label, name, known, "[[variant]]");
      } else if (name == "set") {
        if (const toml::table* changes = node.as_table()) {
          read_changes(*changes, "", path, variant.set);
          if (variant.set.size() > info->max_items) {
            problems_.add(node_where, path,
                          "expected at most " + grouped_count(info->max_items) +
                              " changes, found " + grouped_count(variant.set.size()));
          }
        } else {
          problems_.add(node_where, path,
                        "expected a table of \"path\" = value, found " + describe(node));
        }
      } else {
        std::string problem;
        const std::optional<CaseValue> value = convert(node, *info, problem);
        if (!value) {
          problems_.add(node_where, path, problem);
        } else if (name == "name") {
          variant.name = {std::get<std::string>(*value), node_where, true};
          has_name = true;
        } else {
          // Each removed layer keeps its own location for later messages.
          const toml::array& array = *node.as_array();
          for (std::size_t i = 0; i < array.size(); ++i) {
            variant.remove.push_back({array.get(i)->as_string()->get(),
                                      location_of(array.get(i)->source(), file_), true});
          }
        }
      }
    }
    if (!has_name) {
      problems_.add(where, label + ".name", "required key \"name\" is missing");
    }
    document_.variants.push_back(std::move(variant));
  }

  // Flattens nested tables: set = { layer.top.thickness = 2 } and
  // set = { "layer.top.thickness" = 2 } mean the same.
  void read_changes(const toml::table& table, const std::string& prefix,
                    const std::string& label, std::vector<SetChange>& changes) {
    for (auto&& [key, node] : table) {
      const std::string path = prefix.empty() ? std::string(key.str())
                                              : prefix + "." + std::string(key.str());
      if (const toml::table* nested = node.as_table()) {
        // Recursion is bounded: the text check limited the nesting.
        if (nested->empty()) {
          problems_.add(location_of(key.source(), file_), label + "." + echoed(path),
                        "expected a value for the path " + quoted_echo(path) +
                            ", found an empty table (a change must name a key)");
        }
        read_changes(*nested, path, label, changes);
        continue;
      }
      std::optional<SetChange> change =
          read_change(node, path, label + "." + echoed(path), location_of(key.source(), file_));
      if (change) {
        changes.push_back(std::move(*change));
      }
    }
  }

  std::optional<SetChange> read_change(const toml::node& node, const std::string& path,
                                       const std::string& label, const SourceLocation& key_where) {
    std::string problem;
    const std::optional<ChangeTarget> target = resolve_change_path(path, document_, problem);
    if (!target) {
      problems_.add(key_where, label, problem);
      return std::nullopt;
    }
    const std::optional<CaseValue> value = convert(node, *target->key, problem);
    const SourceLocation where = location_of(node.source(), file_);
    if (!value) {
      problems_.add(where, label, problem);
      return std::nullopt;
    }
    return SetChange{path, *value, where};
  }

  void read_sweep(const toml::table& table) {
    SweepSpec sweep;
    static_cast<SourceLocation&>(sweep.where) = location_of(table.source(), file_);
    const std::vector<std::string> known = case_key_names(CaseSection::sweep);
    for (auto&& [key, node] : table) {
      const std::string name(key.str());
      if (find_case_key(CaseSection::sweep, name) == nullptr) {
        unknown_key(location_of(key.source(), file_), "sweep", name, known, "[sweep]");
      }
    }
    document_.sweep = sweep;
    pending_sweep_ = &table;
  }

  void read_sweep_values(const toml::table& table) {
    SweepSpec& sweep = *document_.sweep;
    const toml::node* parameter = table.get("parameter");
    if (parameter == nullptr) {
      problems_.add(sweep.where, "sweep.parameter", "required key \"parameter\" is missing");
      return;
    }
    const SourceLocation parameter_where = location_of(parameter->source(), file_);
    if (!parameter->is_string()) {
      problems_.add(parameter_where, "sweep.parameter",
                    "expected a dotted path (a string), found " + describe(*parameter));
      return;
    }
    sweep.parameter = {parameter->as_string()->get(), parameter_where, true};
    std::string problem = check_value(CaseValue{sweep.parameter.value},
                                      *find_case_key(CaseSection::sweep, "parameter"));
    if (!problem.empty()) {
      problems_.add(parameter_where, "sweep.parameter", problem);
      return;
    }
    const std::optional<ChangeTarget> target =
        resolve_change_path(sweep.parameter.value, document_, problem);
    if (!target) {
      problems_.add(parameter_where, "sweep.parameter", problem);
      return;
    }
    const toml::node* values = table.get("values");
    const bool has_range =
        table.get("from") != nullptr || table.get("to") != nullptr || table.get("count") != nullptr;
    if (values != nullptr && has_range) {
      problems_.add(location_of(values->source(), file_), "sweep.values",
                    "expected either `values` or `from`, `to`, `count`, found both");
      return;
    }
    if (values != nullptr) {
      const toml::array* array = values->as_array();
      if (array == nullptr || array->empty()) {
        problems_.add(location_of(values->source(), file_), "sweep.values",
                      "expected a non-empty array of values, found " + describe(*values));
        return;
      }
      if (array->size() > limits::sweep_values) {
        // Each value is a whole case to check: a flood is refused unread.
        problems_.add(location_of(values->source(), file_), "sweep.values",
                      "expected at most " + grouped_count(limits::sweep_values) +
                          " values, found " + grouped_count(array->size()));
        return;
      }
      for (std::size_t i = 0; i < array->size(); ++i) {
        std::optional<SetChange> change =
            read_change(*array->get(i), sweep.parameter.value,
                        "sweep.values[" + std::to_string(i + 1) + "]", parameter_where);
        if (change) {
          sweep.values.push_back(std::move(*change));
        }
      }
      return;
    }
    if (!has_range) {
      problems_.add(sweep.where, "sweep.values",
                    "required: `values`, or `from`, `to` and `count`");
      return;
    }
    read_sweep_range(table, *target->key);
  }

  void read_sweep_range(const toml::table& table, const KeyInfo& key) {
    SweepSpec& sweep = *document_.sweep;
    if (key.kind != ValueKind::number && key.kind != ValueKind::length) {
      problems_.add(sweep.parameter.where, "sweep.parameter",
                    "expected a number or length key for `from`, `to`, `count` (use `values` "
                    "for other keys), found " + key.type_text() + " key \"" + key.path() + "\"");
      return;
    }
    SweepRange range;
    bool complete = true;
    for (const char* name : {"from", "to", "count"}) {
      const toml::node* node = table.get(name);
      const std::string path = std::string("sweep.") + name;
      if (node == nullptr) {
        problems_.add(sweep.where, path, std::string("required key \"") + name +
                                             "\" is missing (with the other range keys)");
        complete = false;
        continue;
      }
      std::string problem;
      const std::optional<CaseValue> value =
          convert(*node, *find_case_key(CaseSection::sweep, name), problem);
      if (!value) {
        problems_.add(location_of(node->source(), file_), path, problem);
        complete = false;
      } else if (std::string_view(name) == "count") {
        range.count = static_cast<int>(std::get<std::int64_t>(*value));
      } else {
        (std::string_view(name) == "from" ? range.from : range.to) = std::get<double>(*value);
      }
    }
    if (!complete) {
      return;
    }
    sweep.range = range;
    const SourceLocation where = location_of(table.source(), file_);
    for (int i = 0; i < range.count; ++i) {
      const double fraction = static_cast<double>(i) / (range.count - 1);
      const double value = range.from + fraction * (range.to - range.from);
      const std::string problem = check_value(CaseValue{value}, key);
      if (!problem.empty()) {
        problems_.add(where, "sweep", "value " + std::to_string(i + 1) + " of the range for \"" +
                                          sweep.parameter.value + "\": " + problem);
        return;
      }
      sweep.values.push_back(SetChange{sweep.parameter.value, CaseValue{value}, where});
    }
  }
};

}  // namespace

std::optional<InputProblem> text_problem(std::string_view text, const std::filesystem::path& file) {
  if (text.size() <= limits::case_file_bytes &&
      text.find_first_not_of(" \t\r\n") == std::string_view::npos) {
    return InputProblem{SourceLocation{file.string(), 1, 1}, "",
                        "the case file is empty (expected at least `format = 1`, [geometry], "
                        "[[layer]] and [load])"};
  }
  return toml_text_problem(text, file.string());
}

CaseDocument parse_case_document(std::string_view text, const std::filesystem::path& file) {
  if (const std::optional<InputProblem> problem = text_problem(text, file)) {
    throw InputError({*problem});
  }
  toml::table root;
  try {
    root = toml::parse(text, file.string());
  } catch (const toml::parse_error& error) {
    throw InputError(location_of(error.source(), file), "",
                     "TOML syntax error: " + std::string(error.description()));
  }
  return DocumentParser(file).parse(root);
}

}  // namespace plystrain::casefile
