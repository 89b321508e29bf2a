// Reads material files (the built-in materials/library.toml and the user's)
// into MaterialRecords, merges them by key and formats listings.
#include "plystrain/solver/material_library.hpp"

#include "plystrain/materials/builtin_library.hpp"
#include "plystrain/solver/case_limits.hpp"
#include "plystrain/solver/input_error.hpp"
#include "plystrain/solver/input_text.hpp"
#include "plystrain/solver/text_distance.hpp"
#include "plystrain/solver/toml_text_check.hpp"

#include <toml++/toml.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <fstream>
#include <iomanip>
#include <optional>
#include <sstream>

namespace plystrain {
namespace {

using materials::LawParameters;
using materials::MaterialRecord;
using materials::ModelKind;

constexpr std::array<ModelKind, 6> all_models = {
    ModelKind::linear_elastic, ModelKind::neo_hookean, ModelKind::mooney_rivlin,
    ModelKind::yeoh,           ModelKind::gent,        ModelKind::ogden};

// Keys every material table may carry besides its law parameters.
const std::vector<std::string>& common_keys() {
  static const std::vector<std::string> keys = {
      "model",  "crack_onset_strain", "yield_strain", "density",         "notes",
      "source", "basis",              "method",       "tested_thickness"};
  return keys;
}

const std::vector<std::string>& parameter_keys(ModelKind kind) {
  static const std::vector<std::string> linear = {"youngs_modulus", "poisson_ratio"};
  static const std::vector<std::string> neo = {"youngs_modulus", "poisson_ratio", "shear_modulus",
                                               "bulk_modulus"};
  static const std::vector<std::string> mooney = {"c10", "c01", "bulk_modulus"};
  static const std::vector<std::string> yeoh = {"c10", "c20", "c30", "bulk_modulus"};
  static const std::vector<std::string> gent = {"shear_modulus", "jm", "bulk_modulus"};
  static const std::vector<std::string> ogden = {"mu", "alpha", "bulk_modulus"};
  switch (kind) {
    case ModelKind::linear_elastic:
      return linear;
    case ModelKind::neo_hookean:
      return neo;
    case ModelKind::mooney_rivlin:
      return mooney;
    case ModelKind::yeoh:
      return yeoh;
    case ModelKind::gent:
      return gent;
    case ModelKind::ogden:
      return ogden;
  }
  return neo;
}

const std::vector<std::string> basis_values = {"published", "from-memory", "measured", "demo"};
const std::vector<std::string> method_values = {"tensile",     "wrinkling", "film-on-water",
                                                "indentation", "datasheet", "assumed"};

std::string join(const std::vector<std::string>& words) {
  std::string text;
  for (const std::string& word : words) {
    text += (text.empty() ? "" : ", ") + word;
  }
  return text;
}

std::string quoted_list(const std::vector<std::string>& words) {
  std::string text;
  for (const std::string& word : words) {
    text += (text.empty() ? "\"" : ", \"") + word + "\"";
  }
  return text;
}

std::string type_name(const toml::node& node) {
  switch (node.type()) {
    case toml::node_type::string:
      return "a string";
    case toml::node_type::integer:
      return "an integer";
    case toml::node_type::floating_point:
      return "a number";
    case toml::node_type::boolean:
      return "a boolean";
    case toml::node_type::array:
      return "an array";
    case toml::node_type::table:
      return "a table";
    default:
      return "a date or time";
  }
}

std::string format_number(double value) {
  std::ostringstream text;
  text << std::setprecision(6) << value;
  return text.str();
}

// Reads one material file's text, collecting every problem before throwing.
class MaterialFileReader {
 public:
  explicit MaterialFileReader(std::string file_name) : file_(std::move(file_name)) {}

  std::map<std::string, MaterialRecord> read(std::string_view text) {
    if (const std::optional<InputProblem> problem = toml_text_problem(text, file_)) {
      throw InputError({*problem});
    }
    toml::table root;
    try {
      root = toml::parse(text, file_);
    } catch (const toml::parse_error& error) {
      throw InputError(SourceLocation{file_, static_cast<int>(error.source().begin.line),
                                      static_cast<int>(error.source().begin.column)},
                       "", "not valid TOML: " + std::string(error.description()));
    }
    std::map<std::string, MaterialRecord> records;
    for (const auto& [key, node] : root) {
      const std::string name(key.str());
      if (has_control_characters(name) || character_count(name) > limits::name_characters) {
        problem(node, "material." + echoed(name),
                "expected a material key of at most " + grouped_count(limits::name_characters) +
                    " characters without control characters, found " + quoted_echo(name));
        continue;
      }
      const toml::table* table = node.as_table();
      if (table == nullptr) {
        problem(node, "material." + name,
                "expected a table [" + name + "] describing one material, found " +
                    type_name(node));
        continue;
      }
      if (std::optional<MaterialRecord> record = read_material(name, *table)) {
        records.emplace(name, std::move(*record));
      }
    }
    if (!problems_.empty()) {
      throw InputError(std::move(problems_));
    }
    return records;
  }

 private:
  SourceLocation where(const toml::source_region& region) const {
    return {file_, static_cast<int>(region.begin.line), static_cast<int>(region.begin.column)};
  }

  void problem(const toml::node& node, std::string key_path, std::string message) {
    problems_.push_back({where(node.source()), std::move(key_path), std::move(message)});
  }

  std::optional<MaterialRecord> read_material(const std::string& name, const toml::table& table) {
    const std::size_t problems_before = problems_.size();
    const std::string path = "material." + name;
    MaterialRecord record;
    record.key = name;
    record.defined_in = file_;

    const std::optional<ModelKind> kind = read_model(path, table);
    if (!kind) {
      return std::nullopt;
    }
    record.law.kind = *kind;
    check_unknown_keys(path, table, *kind);

    read_law_parameters(path, table, record.law);
    record.crack_onset_strain = optional_positive(path, table, "crack_onset_strain");
    record.yield_strain = optional_positive(path, table, "yield_strain");
    record.density = optional_positive(path, table, "density");
    record.notes = optional_string(path, table, "notes").value_or("");
    record.source = required_string(path, table, "source").value_or("");
    record.basis = required_choice(path, table, "basis", basis_values).value_or("");
    record.method = required_choice(path, table, "method", method_values).value_or("");
    if (std::optional<std::string> thickness =
            optional_string(path, table, "tested_thickness")) {
      check_thickness(path, table, *thickness);
      record.tested_thickness = *thickness;
    }
    if (problems_.size() != problems_before) {
      return std::nullopt;
    }
    const std::string invalid = materials::validate(record.law);
    if (!invalid.empty()) {
      const std::string parameter = parameter_named_in(invalid, *kind);
      const toml::node* node = parameter.empty() ? nullptr : table.get(parameter);
      problems_.push_back({where(node != nullptr ? node->source() : table.source()),
                           parameter.empty() ? path : path + "." + parameter, invalid});
      return std::nullopt;
    }
    fill_derived_moduli(record.law);
    if (!check_ranges(path, table, record)) {
      return std::nullopt;
    }
    return record;
  }

  // Values that pass as positive and finite but are no material's: a
  // denormal modulus, a modulus of a petapascal, a strain limit of 10^6.
  bool check_ranges(const std::string& path, const toml::table& table,
                    const MaterialRecord& record) {
    const std::size_t problems_before = problems_.size();
    const auto range = [&](const char* key, double value, double low, double high,
                           const std::string& what) {
      if (!(value >= low && value <= high)) {
        const toml::node* node = table.get(key);
        problems_.push_back({where(node != nullptr ? node->source() : table.source()),
                             path + (node != nullptr ? "." + std::string(key) : ""),
                             "expected " + what + " from " + format_number(low) + " to " +
                                 format_number(high) + ", found " + format_number(value)});
      }
    };
    const LawParameters& law = record.law;
    if (table.get("youngs_modulus") != nullptr) {
      range("youngs_modulus", law.youngs_modulus, limits::smallest_modulus_mpa,
            limits::largest_modulus_mpa, "a Young's modulus (MPa)");
    } else {
      const char* shear_key = table.get("c10") != nullptr ? "c10" : "shear_modulus";
      range(shear_key, law.shear_modulus, limits::smallest_modulus_mpa, limits::largest_modulus_mpa,
            "an initial shear modulus (MPa)");
      range("bulk_modulus", law.bulk_modulus, limits::smallest_modulus_mpa,
            limits::largest_bulk_modulus_mpa, "a bulk modulus (MPa)");
    }
    for (const auto& [key, strain] : {std::pair{"crack_onset_strain", record.crack_onset_strain},
                                      std::pair{"yield_strain", record.yield_strain}}) {
      if (strain) {
        range(key, *strain, limits::smallest_limit_strain, limits::largest_limit_strain,
              std::string("a ") + key);
      }
    }
    return problems_.size() == problems_before;
  }

  std::optional<ModelKind> read_model(const std::string& path, const toml::table& table) {
    const toml::node* node = table.get("model");
    std::vector<std::string> names;
    for (const ModelKind kind : all_models) {
      names.emplace_back(materials::model_key(kind));
    }
    if (node == nullptr) {
      problems_.push_back({where(table.source()), path + ".model",
                           "missing: every material needs model = one of " + quoted_list(names)});
      return std::nullopt;
    }
    const std::optional<std::string> value = node->value<std::string>();
    if (!node->is_string() || !value) {
      problem(*node, path + ".model", "expected a string, found " + type_name(*node));
      return std::nullopt;
    }
    for (const ModelKind kind : all_models) {
      if (*value == materials::model_key(kind)) {
        return kind;
      }
    }
    std::string message = "unknown model \"" + *value + "\"";
    if (const std::string hint = closest_match(*value, names); !hint.empty()) {
      message += " (did you mean \"" + hint + "\"?)";
    }
    problem(*node, path + ".model", message + "; known models: " + quoted_list(names));
    return std::nullopt;
  }

  void check_unknown_keys(const std::string& path, const toml::table& table, ModelKind kind) {
    std::vector<std::string> allowed = common_keys();
    const std::vector<std::string>& parameters = parameter_keys(kind);
    allowed.insert(allowed.end(), parameters.begin(), parameters.end());
    for (const auto& [key, node] : table) {
      const std::string name(key.str());
      if (std::find(allowed.begin(), allowed.end(), name) != allowed.end()) {
        continue;
      }
      std::string message = "unknown key \"" + name + "\"";
      if (const std::string hint = closest_match(name, allowed); !hint.empty()) {
        message += " (did you mean \"" + hint + "\"?)";
      } else if (const std::string other_model = model_with_parameter(name);
                 !other_model.empty()) {
        message += " (a parameter of model \"" + other_model + "\")";
      }
      message += "; parameters of model \"" + std::string(materials::model_key(kind)) +
                 "\": " + join(parameters);
      problems_.push_back({where(key.source()), path + "." + name, message});
    }
  }

  static std::string model_with_parameter(const std::string& name) {
    for (const ModelKind kind : all_models) {
      const std::vector<std::string>& parameters = parameter_keys(kind);
      if (std::find(parameters.begin(), parameters.end(), name) != parameters.end()) {
        return materials::model_key(kind);
      }
    }
    return {};
  }

  // The parameter a validate() message is about: the first parameter name it
  // mentions, so the error points at that line.
  static std::string parameter_named_in(const std::string& message, ModelKind kind) {
    std::string best;
    std::size_t best_position = std::string::npos;
    for (const std::string& parameter : parameter_keys(kind)) {
      const std::size_t position = message.find(parameter);
      if (position != std::string::npos && position < best_position) {
        best = parameter;
        best_position = position;
      }
    }
    return best;
  }

  std::optional<double> number(const std::string& path, const toml::table& table,
                               const std::string& key) {
    const toml::node* node = table.get(key);
    if (node == nullptr) {
      return std::nullopt;
    }
    if (!node->is_number()) {
      problem(*node, path + "." + key, "expected a number, found " + type_name(*node));
      return std::nullopt;
    }
    const double value = node->value<double>().value_or(0.0);
    if (!std::isfinite(value)) {
      problem(*node, path + "." + key, "expected a finite number, found " + format_number(value));
      return std::nullopt;
    }
    return value;
  }

  double required_number(const std::string& path, const toml::table& table,
                         const std::string& key, const std::string& why) {
    if (table.get(key) == nullptr) {
      problems_.push_back({where(table.source()), path + "." + key, "missing (" + why + ")"});
      return 0.0;
    }
    return number(path, table, key).value_or(0.0);
  }

  std::vector<double> required_array(const std::string& path, const toml::table& table,
                                     const std::string& key) {
    const toml::node* node = table.get(key);
    if (node == nullptr) {
      problems_.push_back({where(table.source()), path + "." + key,
                           "missing (model \"ogden\" needs arrays mu and alpha)"});
      return {};
    }
    const toml::array* array = node->as_array();
    if (array == nullptr) {
      problem(*node, path + "." + key, "expected an array of numbers, found " + type_name(*node));
      return {};
    }
    std::vector<double> values;
    for (std::size_t i = 0; i < array->size(); ++i) {
      const toml::node& element = *array->get(i);
      if (!element.is_number()) {
        problem(element, path + "." + key + "[" + std::to_string(i) + "]",
                "expected a number, found " + type_name(element));
        continue;
      }
      values.push_back(element.value<double>().value_or(0.0));
    }
    return values;
  }

  void read_law_parameters(const std::string& path, const toml::table& table,
                           LawParameters& law) {
    const auto has = [&](const char* key) { return table.get(key) != nullptr; };
    const std::string model = materials::model_key(law.kind);
    const std::string needs = "model \"" + model + "\" needs " + join(parameter_keys(law.kind));
    switch (law.kind) {
      case ModelKind::linear_elastic:
        law.youngs_modulus = required_number(path, table, "youngs_modulus", needs);
        law.poisson_ratio = required_number(path, table, "poisson_ratio", needs);
        break;
      case ModelKind::neo_hookean: {
        const bool young_poisson = has("youngs_modulus") || has("poisson_ratio");
        const bool shear_bulk = has("shear_modulus") || has("bulk_modulus");
        const std::string pair_rule =
            "model \"neo-hookean\" takes youngs_modulus and poisson_ratio, or shear_modulus "
            "and bulk_modulus";
        if (young_poisson && shear_bulk) {
          const toml::node* extra =
              has("shear_modulus") ? table.get("shear_modulus") : table.get("bulk_modulus");
          problem(*extra, path + "." + (has("shear_modulus") ? "shear_modulus" : "bulk_modulus"),
                  pair_rule + ", not both");
        } else if (shear_bulk) {
          law.shear_modulus = required_number(path, table, "shear_modulus", pair_rule);
          law.bulk_modulus = required_number(path, table, "bulk_modulus", pair_rule);
        } else {
          law.youngs_modulus = required_number(path, table, "youngs_modulus", pair_rule);
          law.poisson_ratio = required_number(path, table, "poisson_ratio", pair_rule);
        }
        break;
      }
      case ModelKind::mooney_rivlin:
        law.c10 = required_number(path, table, "c10", needs);
        law.c01 = required_number(path, table, "c01", needs);
        law.bulk_modulus = required_number(path, table, "bulk_modulus", needs);
        break;
      case ModelKind::yeoh:
        law.c10 = required_number(path, table, "c10", needs);
        law.c20 = required_number(path, table, "c20", needs);
        law.c30 = required_number(path, table, "c30", needs);
        law.bulk_modulus = required_number(path, table, "bulk_modulus", needs);
        break;
      case ModelKind::gent:
        law.shear_modulus = required_number(path, table, "shear_modulus", needs);
        law.jm = required_number(path, table, "jm", needs);
        law.bulk_modulus = required_number(path, table, "bulk_modulus", needs);
        break;
      case ModelKind::ogden:
        law.ogden_mu = required_array(path, table, "mu");
        law.ogden_alpha = required_array(path, table, "alpha");
        law.bulk_modulus = required_number(path, table, "bulk_modulus", needs);
        break;
    }
  }

  // Reports need E and nu for every kind, the laws need mu and kappa: keep
  // both, derived from what the file gave.
  static void fill_derived_moduli(LawParameters& law) {
    const double mu = materials::initial_shear_modulus(law);
    const double kappa = materials::initial_bulk_modulus(law);
    if (law.kind == ModelKind::linear_elastic || law.kind == ModelKind::neo_hookean) {
      if (law.youngs_modulus > 0.0) {
        const materials::ShearBulk derived =
            materials::to_shear_bulk(law.youngs_modulus, law.poisson_ratio);
        law.shear_modulus = derived.shear_modulus;
        law.bulk_modulus = derived.bulk_modulus;
        return;
      }
    }
    law.shear_modulus = mu;
    law.bulk_modulus = kappa;
    const materials::YoungPoisson derived = materials::to_young_poisson(mu, kappa);
    law.youngs_modulus = derived.youngs_modulus;
    law.poisson_ratio = derived.poisson_ratio;
  }

  std::optional<double> optional_positive(const std::string& path, const toml::table& table,
                                          const std::string& key) {
    const std::optional<double> value = number(path, table, key);
    if (value && !(*value > 0.0)) {
      problem(*table.get(key), path + "." + key,
              "expected a positive number, found " + format_number(*value));
      return std::nullopt;
    }
    return value;
  }

  std::optional<std::string> optional_string(const std::string& path, const toml::table& table,
                                             const std::string& key) {
    const toml::node* node = table.get(key);
    if (node == nullptr) {
      return std::nullopt;
    }
    if (!node->is_string()) {
      problem(*node, path + "." + key, "expected a string, found " + type_name(*node));
      return std::nullopt;
    }
    // Listings and reports print these strings: none may act on a terminal.
    const std::string& text = node->as_string()->get();
    if (has_control_characters(text) || character_count(text) > limits::text_characters) {
      problem(*node, path + "." + key,
              "expected a string of at most " + grouped_count(limits::text_characters) +
                  " characters without control characters, found " + quoted_echo(text));
      return std::nullopt;
    }
    return text;
  }

  std::optional<std::string> required_string(const std::string& path, const toml::table& table,
                                             const std::string& key) {
    if (table.get(key) == nullptr) {
      problems_.push_back({where(table.source()), path + "." + key,
                           "missing: every material states the source of its values"});
      return std::nullopt;
    }
    std::optional<std::string> value = optional_string(path, table, key);
    if (value && value->find_first_not_of(" \t") == std::string::npos) {
      problem(*table.get(key), path + "." + key, "must not be empty");
      return std::nullopt;
    }
    return value;
  }

  std::optional<std::string> required_choice(const std::string& path, const toml::table& table,
                                             const std::string& key,
                                             const std::vector<std::string>& choices) {
    if (table.get(key) == nullptr) {
      problems_.push_back({where(table.source()), path + "." + key,
                           "missing: one of " + quoted_list(choices)});
      return std::nullopt;
    }
    const std::optional<std::string> value = optional_string(path, table, key);
    if (!value) {
      return std::nullopt;
    }
    if (std::find(choices.begin(), choices.end(), *value) == choices.end()) {
      std::string message = "unknown " + key + " \"" + *value + "\"";
      if (const std::string hint = closest_match(*value, choices); !hint.empty()) {
        message += " (did you mean \"" + hint + "\"?)";
      }
      problem(*table.get(key), path + "." + key,
              message + "; expected one of " + quoted_list(choices));
      return std::nullopt;
    }
    return value;
  }

  // "120 nm", "50-200 nm", "1.5 um": a number or range with a length unit.
  void check_thickness(const std::string& path, const toml::table& table,
                       const std::string& text) {
    static const std::vector<std::string> units = {"nm", "um", "mm", "m"};
    std::istringstream stream(text);
    std::string amount;
    std::string unit;
    std::string rest;
    stream >> amount >> unit >> rest;
    const bool amount_ok = !amount.empty() &&
                           amount.find_first_not_of("0123456789.-eE+") == std::string::npos &&
                           std::isdigit(static_cast<unsigned char>(amount.front()));
    const bool unit_ok = std::find(units.begin(), units.end(), unit) != units.end();
    if (!amount_ok || !unit_ok || !rest.empty()) {
      problem(*table.get("tested_thickness"), path + ".tested_thickness",
              "expected a length with its unit, e.g. \"120 nm\" or \"50-200 nm\" (units nm, um, "
              "mm, m), found \"" + text + "\"");
    }
  }

  std::string file_;
  std::vector<InputProblem> problems_;
};

// The file's first limits::case_file_bytes + 1 bytes: enough for the text
// check to say where the limit is passed, never the whole of a huge file.
std::string read_file_text(const std::filesystem::path& file) {
  std::ifstream stream(file, std::ios::binary);
  if (!stream) {
    throw InputError(SourceLocation{file.string(), 0, 0}, "",
                     "cannot read the material file (does it exist?)");
  }
  std::string text(limits::case_file_bytes + 1, '\0');
  stream.read(text.data(), static_cast<std::streamsize>(text.size()));
  text.resize(static_cast<std::size_t>(stream.gcount()));
  return text;
}

std::string percent(const std::optional<double>& fraction) {
  if (!fraction) {
    return "-";
  }
  std::ostringstream text;
  text << std::setprecision(3) << *fraction * 100.0 << " %";
  return text.str();
}

std::string significant(double value, int digits) {
  std::ostringstream text;
  text << std::setprecision(digits) << value;
  return text.str();
}

// Moduli span 0.05 MPa to 2e5 MPa: whole MPa above 1000, else 4 digits,
// never an exponent.
std::string modulus_text(double value) {
  std::ostringstream text;
  if (std::abs(value) >= 1000.0) {
    text << std::fixed << std::setprecision(0) << value;
  } else {
    text << std::setprecision(4) << value;
  }
  return text.str();
}

}  // namespace

MaterialLibrary::MaterialLibrary(std::map<std::string, materials::MaterialRecord> records)
    : records_(std::move(records)) {}

const materials::MaterialRecord* MaterialLibrary::find(std::string_view key) const {
  const auto found = records_.find(std::string(key));
  return found == records_.end() ? nullptr : &found->second;
}

std::vector<std::string> MaterialLibrary::keys() const {
  std::vector<std::string> names;
  names.reserve(records_.size());
  for (const auto& [key, record] : records_) {
    names.push_back(key);
  }
  return names;
}

std::string MaterialLibrary::closest_key(std::string_view key) const {
  return closest_match(key, keys());
}

MaterialLibrary load_builtin_library() {
  return MaterialLibrary(MaterialFileReader(std::string(materials::builtin_library_name))
                             .read(materials::builtin_library_text()));
}

MaterialLibrary load_material_library(const std::vector<std::filesystem::path>& user_files) {
  std::map<std::string, MaterialRecord> records = load_builtin_library().records();
  for (const std::filesystem::path& file : user_files) {
    const std::string text = read_file_text(file);
    for (auto& [key, record] : MaterialFileReader(file.string()).read(text)) {
      records.insert_or_assign(key, std::move(record));
    }
  }
  return MaterialLibrary(std::move(records));
}

std::string format_material_table(const MaterialLibrary& library) {
  std::size_t key_width = 3;
  for (const auto& [key, record] : library.records()) {
    key_width = std::max(key_width, key.size());
  }
  std::ostringstream text;
  text << std::left << std::setw(static_cast<int>(key_width) + 2) << "key" << std::setw(16)
       << "model" << std::right << std::setw(12) << "E [MPa]" << std::setw(9) << "nu"
       << std::setw(14) << "crack onset" << std::setw(10) << "yield" << "  " << std::left
       << "basis\n";
  for (const auto& [key, record] : library.records()) {
    const materials::YoungPoisson elastic =
        materials::to_young_poisson(materials::initial_shear_modulus(record.law),
                                    materials::initial_bulk_modulus(record.law));
    text << std::left << std::setw(static_cast<int>(key_width) + 2) << key << std::setw(16)
         << materials::model_key(record.law.kind) << std::right << std::setw(12)
         << modulus_text(elastic.youngs_modulus) << std::setw(9)
         << significant(elastic.poisson_ratio, 4) << std::setw(14)
         << percent(record.crack_onset_strain) << std::setw(10) << percent(record.yield_strain)
         << "  " << std::left << record.basis << '\n';
  }
  return text.str();
}

std::string format_material_detail(const materials::MaterialRecord& record) {
  const LawParameters& law = record.law;
  std::ostringstream text;
  const auto line = [&](const std::string& label, const std::string& value) {
    text << std::left << std::setw(20) << label << value << '\n';
  };
  const auto list = [](const std::vector<double>& values) {
    std::string joined;
    for (const double value : values) {
      joined += (joined.empty() ? "" : ", ") + significant(value, 6);
    }
    return "[" + joined + "]";
  };
  line("key", record.key);
  line("model", materials::model_key(law.kind));
  switch (law.kind) {
    case ModelKind::linear_elastic:
    case ModelKind::neo_hookean:
      break;
    case ModelKind::mooney_rivlin:
      line("c10", significant(law.c10, 6) + " MPa");
      line("c01", significant(law.c01, 6) + " MPa");
      break;
    case ModelKind::yeoh:
      line("c10", significant(law.c10, 6) + " MPa");
      line("c20", significant(law.c20, 6) + " MPa");
      line("c30", significant(law.c30, 6) + " MPa");
      break;
    case ModelKind::gent:
      line("jm", significant(law.jm, 6));
      break;
    case ModelKind::ogden:
      line("mu", list(law.ogden_mu) + " MPa");
      line("alpha", list(law.ogden_alpha));
      break;
  }
  const double mu = materials::initial_shear_modulus(law);
  const double kappa = materials::initial_bulk_modulus(law);
  const materials::YoungPoisson elastic = materials::to_young_poisson(mu, kappa);
  line("youngs_modulus", significant(elastic.youngs_modulus, 6) + " MPa (small strain)");
  line("poisson_ratio", significant(elastic.poisson_ratio, 6));
  line("shear_modulus", significant(mu, 6) + " MPa (small strain)");
  line("bulk_modulus", significant(kappa, 6) + " MPa");
  line("crack_onset_strain", record.crack_onset_strain
                                 ? significant(*record.crack_onset_strain, 4) + " (" +
                                       percent(record.crack_onset_strain) + ")"
                                 : "not known");
  line("yield_strain", record.yield_strain ? significant(*record.yield_strain, 4) + " (" +
                                                 percent(record.yield_strain) + ")"
                                           : "not known");
  if (record.density) {
    line("density", significant(*record.density, 5) + " kg/m^3");
  }
  line("tested_thickness", record.tested_thickness.empty() ? "not stated"
                                                           : record.tested_thickness);
  line("basis", record.basis);
  line("method", record.method);
  line("source", record.source);
  if (!record.notes.empty()) {
    line("notes", record.notes);
  }
  line("defined in", record.defined_in);
  return text.str();
}

}  // namespace plystrain
