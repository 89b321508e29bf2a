#include "case_document.hpp"

#include "plystrain/solver/case_limits.hpp"
#include "plystrain/solver/input_text.hpp"
#include "plystrain/solver/text_distance.hpp"

#include <algorithm>
#include <charconv>
#include <cmath>

namespace plystrain::casefile {

const Entry* Table::find(std::string_view key) const {
  const auto found = entries.find(key);
  return found == entries.end() ? nullptr : &found->second;
}

const std::string* Table::text(std::string_view key) const {
  const Entry* entry = find(key);
  return entry == nullptr ? nullptr : std::get_if<std::string>(&entry->value);
}

std::string CaseDocument::layer_label(std::size_t index) const {
  if (index < layers.size()) {
    if (const std::string* name = layers[index].text("name"); name != nullptr && !name->empty()) {
      return "layer." + *name;
    }
  }
  return "layer[" + std::to_string(index + 1) + "]";
}

std::string CaseDocument::defect_label(std::size_t index) {
  return "defect[" + std::to_string(index + 1) + "]";
}

void Problems::add(SourceLocation where, std::string key_path, std::string message) {
  // Enough distinct kinds for any real file; past them a file is only counted.
  constexpr std::size_t kinds_kept = 200;
  InputProblem problem{std::move(where), std::move(key_path), std::move(message)};
  const std::string kind = problem_kind(problem);
  const auto found = kinds_.find(kind);
  if (found == kinds_.end()) {
    if (kinds_.size() >= kinds_kept) {
      ++not_kept_;
      return;
    }
    kinds_.emplace(kind, Tally{1, list_.size()});
    list_.push_back(std::move(problem));
  } else if (found->second.kept < problems_listed_per_kind) {
    found->second.kept += 1;
    found->second.last = list_.size();
    list_.push_back(std::move(problem));
  } else {
    list_[found->second.last].similar_not_listed += 1;
  }
}

void Problems::throw_if_any() const {
  if (!empty()) {
    // In file order: the first problem the user reads is the first in the file.
    std::vector<InputProblem> sorted = list_;
    std::stable_sort(sorted.begin(), sorted.end(), [](const InputProblem& a, const InputProblem& b) {
      return a.where.line != b.where.line ? a.where.line < b.where.line
                                          : a.where.column < b.where.column;
    });
    throw InputError(sorted, not_kept_);
  }
}

std::string float_text(double value) {
  char buffer[64];
  const auto result = std::to_chars(buffer, buffer + sizeof buffer, value);
  std::string text(buffer, result.ptr);
  if (std::isfinite(value) && text.find_first_of(".e") == std::string::npos) {
    text += ".0";
  }
  return text;
}

namespace {

std::string toml_quoted(std::string_view text) {
  std::string out = "\"";
  for (const char c : text) {
    const auto byte = static_cast<unsigned char>(c);
    if (c == '"' || c == '\\') {
      out += '\\';
      out += c;
    } else if (byte < 0x20 || byte == 0x7F) {
      static const char* hex = "0123456789ABCDEF";
      out += "\\u00";
      out += hex[byte >> 4];
      out += hex[byte & 0xF];
    } else {
      out += c;
    }
  }
  return out + "\"";
}

bool within(double value, const KeyInfo& key) {
  if (key.min && (key.min->open ? value <= key.min->value : value < key.min->value)) {
    return false;
  }
  return !(key.max && (key.max->open ? value >= key.max->value : value > key.max->value));
}

std::string bound_message(const KeyInfo& key, const std::string& found) {
  return "expected " + key.type_text() + ", found " + found;
}

std::string choice_message(const KeyInfo& key, const std::string& found) {
  std::vector<std::string> names;
  for (const KeyChoice& choice : key.choices) {
    names.emplace_back(choice.name);
  }
  std::string message = "expected " + key.type_text() + ", found " + quoted_echo(found);
  const std::string hint = closest_match(found, names);
  if (!hint.empty()) {
    message += " (did you mean \"" + hint + "\"?)";
  }
  return message;
}

// A string of the case: not too long, no control characters; a name also
// only of [a-z0-9-]. Empty when it is fine.
std::string text_problem_of(const std::string& text, bool name, std::string_view what) {
  const std::size_t longest = name ? limits::name_characters : limits::text_characters;
  const std::size_t length = character_count(text);
  if (length > longest) {
    return "expected " + std::string(what) + " of at most " + grouped_count(longest) +
           " characters, found " + grouped_count(length) + ": " + quoted_echo(text);
  }
  if (name ? !is_case_name(text) : has_control_characters(text)) {
    return "expected " + std::string(what) +
           (name ? " of lower-case letters, digits and -" : " without control characters") +
           ", found " + quoted_echo(text);
  }
  return "";
}

std::string too_many_items(const KeyInfo& key, std::size_t count) {
  return "expected at most " + grouped_count(key.max_items) + " values, found " +
         grouped_count(count);
}

template <class T>
bool over_item_limit(const std::vector<T>& items, const KeyInfo& key) {
  return key.max_items > 0 && items.size() > key.max_items;
}

}  // namespace

bool is_case_name(std::string_view text) {
  // A loop, not a pattern: the standard regex engine recurses per character
  // and a 50,000-character name ran it out of stack.
  return !text.empty() && std::all_of(text.begin(), text.end(), [](char c) {
    return (c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') || c == '-';
  });
}

std::string check_value(const CaseValue& value, const KeyInfo& key) {
  if (const auto* integer = std::get_if<std::int64_t>(&value)) {
    return within(static_cast<double>(*integer), key) ? ""
                                                      : bound_message(key, std::to_string(*integer));
  }
  if (const auto* number = std::get_if<double>(&value)) {
    return within(*number, key) ? "" : bound_message(key, float_text(*number));
  }
  if (const auto* numbers = std::get_if<std::vector<double>>(&value)) {
    if (over_item_limit(*numbers, key)) {
      return too_many_items(key, numbers->size());
    }
    for (const double number : *numbers) {
      if (!within(number, key)) {
        return bound_message(key, float_text(number));
      }
    }
    return "";
  }
  if (const auto* points = std::get_if<std::vector<std::array<double, 2>>>(&value)) {
    return over_item_limit(*points, key) ? too_many_items(key, points->size()) : "";
  }
  if (const auto* text = std::get_if<std::string>(&value)) {
    switch (key.kind) {
      case ValueKind::choice:
      case ValueKind::choice_or_number:
        return key.allows_choice(*text) ? "" : choice_message(key, *text);
      case ValueKind::name:
        return text_problem_of(*text, true, "a name");
      default:
        return text_problem_of(*text, false, "a string");
    }
  }
  if (const auto* texts = std::get_if<std::vector<std::string>>(&value)) {
    if (over_item_limit(*texts, key)) {
      return too_many_items(key, texts->size());
    }
    const bool names = key.kind == ValueKind::names;
    for (const std::string& text : *texts) {
      if (std::string problem = text_problem_of(text, names, names ? "layer names" : "paths");
          !problem.empty()) {
        return problem;
      }
    }
  }
  return "";
}

std::string value_text(const CaseValue& value) {
  struct Printer {
    std::string operator()(bool flag) const { return flag ? "true" : "false"; }
    std::string operator()(std::int64_t integer) const { return std::to_string(integer); }
    std::string operator()(double number) const { return float_text(number); }
    std::string operator()(const std::string& text) const { return toml_quoted(text); }
    std::string operator()(const std::vector<double>& numbers) const {
      std::string text = "[";
      for (std::size_t i = 0; i < numbers.size(); ++i) {
        text += (i > 0 ? ", " : "") + float_text(numbers[i]);
      }
      return text + "]";
    }
    std::string operator()(const std::vector<std::array<double, 2>>& points) const {
      std::string text = "[";
      for (std::size_t i = 0; i < points.size(); ++i) {
        text += (i > 0 ? ", [" : "[") + float_text(points[i][0]) + ", " + float_text(points[i][1]) +
                "]";
      }
      return text + "]";
    }
    std::string operator()(const std::vector<std::string>& texts) const {
      std::string text = "[";
      for (std::size_t i = 0; i < texts.size(); ++i) {
        text += (i > 0 ? ", " : "") + toml_quoted(texts[i]);
      }
      return text + "]";
    }
  };
  return std::visit(Printer{}, value);
}

Applies key_applies(const KeyInfo& key, const Table& table, const CaseDocument& document) {
  for (const KeyCondition& condition : key.applies_when) {
    const std::string* value = nullptr;
    std::string fallback;
    if (condition.key == "geometry.shape") {
      value = document.geometry.text("shape");
    } else {
      value = table.text(condition.key);
      if (value == nullptr) {
        const KeyInfo* decider = find_case_key(key.section, condition.key);
        if (decider != nullptr && decider->fixed_default) {
          if (const auto* text = std::get_if<std::string>(&*decider->fixed_default)) {
            fallback = *text;
            value = &fallback;
          }
        }
      }
    }
    if (value == nullptr) {
      return Applies::unknown;
    }
    if (std::find(condition.values.begin(), condition.values.end(), *value) ==
        condition.values.end()) {
      return Applies::no;
    }
  }
  return Applies::yes;
}

std::optional<ChangeTarget> resolve_change_path(const std::string& path,
                                                const CaseDocument& document,
                                                std::string& problem) {
  if (path.size() > limits::text_characters || has_control_characters(path)) {
    problem = "expected a path of at most " + grouped_count(limits::text_characters) +
              " characters without control characters, found " + quoted_echo(path);
    return std::nullopt;
  }
  std::vector<std::string> parts;
  std::size_t start = 0;
  while (true) {
    const std::size_t dot = path.find('.', start);
    parts.push_back(path.substr(start, dot == std::string::npos ? std::string::npos : dot - start));
    if (dot == std::string::npos) {
      break;
    }
    start = dot + 1;
  }
  const std::string forms =
      "expected layer.<name>.<key>, defect.<index>.<key>, geometry.<key>, load.<key>, "
      "mesh.<key>, report.<key> or title";
  ChangeTarget target;
  std::string key_name;
  const std::string& head = parts.front();
  if (parts.size() == 1) {
    target.section = CaseSection::top;
    key_name = head;
  } else if (parts.size() == 2 &&
             (head == "geometry" || head == "load" || head == "mesh" || head == "report")) {
    target.section = head == "geometry" ? CaseSection::geometry
                     : head == "load"   ? CaseSection::load
                     : head == "mesh"   ? CaseSection::mesh
                                        : CaseSection::report;
    key_name = parts[1];
  } else if (parts.size() == 3 && head == "layer") {
    target.section = CaseSection::layer;
    std::vector<std::string> names;
    bool found = false;
    for (std::size_t i = 0; i < document.layers.size(); ++i) {
      if (const std::string* name = document.layers[i].text("name")) {
        names.push_back(*name);
        if (*name == parts[1]) {
          target.index = i;
          found = true;
        }
      }
    }
    if (!found) {
      problem = "path " + quoted_echo(path) + ": no layer is named " + quoted_echo(parts[1]);
      const std::string hint = closest_match(parts[1], names);
      if (!hint.empty()) {
        problem += " (did you mean \"" + hint + "\"?)";
      }
      return std::nullopt;
    }
    key_name = parts[2];
  } else if (parts.size() == 3 && head == "defect") {
    target.section = CaseSection::defect;
    int index = 0;
    const auto [end, error] =
        std::from_chars(parts[1].data(), parts[1].data() + parts[1].size(), index);
    if (error != std::errc{} || end != parts[1].data() + parts[1].size() || index < 1 ||
        static_cast<std::size_t>(index) > document.defects.size()) {
      problem = "path " + quoted_echo(path) + ": expected a defect index from 1 to " +
                std::to_string(document.defects.size()) + ", found " + quoted_echo(parts[1]);
      return std::nullopt;
    }
    target.index = static_cast<std::size_t>(index - 1);
    key_name = parts[2];
  } else {
    problem = "unknown path " + quoted_echo(path) + ": " + forms;
    return std::nullopt;
  }
  target.key = find_case_key(target.section, key_name);
  if (target.key == nullptr) {
    problem = "path " + quoted_echo(path) + ": unknown key " + quoted_echo(key_name);
    const std::string hint = closest_match(key_name, case_key_names(target.section));
    if (!hint.empty()) {
      problem += " (did you mean \"" + hint + "\"?)";
    } else if (target.section == CaseSection::top) {
      problem += "; " + forms;
    }
    return std::nullopt;
  }
  if (!target.key->settable) {
    problem = "path " + quoted_echo(path) + ": " + quoted_echo(key_name) +
              "\" cannot be changed by a variant or a sweep";
    return std::nullopt;
  }
  return target;
}

Table& target_table(CaseDocument& document, const ChangeTarget& target) {
  switch (target.section) {
    case CaseSection::geometry: return document.geometry;
    case CaseSection::load: return document.load;
    case CaseSection::mesh: return document.mesh;
    case CaseSection::report: return document.report;
    case CaseSection::layer: return document.layers.at(target.index);
    case CaseSection::defect: return document.defects.at(target.index);
    default: return document.top;
  }
}

}  // namespace plystrain::casefile

namespace plystrain {

std::string case_value_text(const CaseValue& value) { return casefile::value_text(value); }

}  // namespace plystrain
