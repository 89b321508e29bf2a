// Mutants of case files for the reader's fuzz test: line edits (delete,
// duplicate, swap, splice from another case), extreme numbers, values of the
// wrong type, control characters, huge and deeply nested inputs, and raw byte
// edits. Each mutant is a function of its seed case, its number and the run's
// seed alone, so that a failing mutant can be made again by its number.
#pragma once

#include <cstdint>
#include <random>
#include <string>
#include <string_view>
#include <vector>

namespace plystrain::fuzz {

struct Mutant {
  std::string text;
  std::vector<std::string> edits;  // what was done, for the failure message
};

class CaseMutator {
 public:
  CaseMutator(std::vector<std::string> seeds, std::uint64_t run_seed)
      : seeds_(std::move(seeds)), run_seed_(run_seed) {}

  [[nodiscard]] std::size_t seed_count() const { return seeds_.size(); }

  // Mutant `number` of seed `number % seed_count()`, with one to three edits.
  [[nodiscard]] Mutant make(std::size_t number) const {
    std::mt19937_64 random(run_seed_ * 1000003u + number);
    Mutant mutant{seeds_[number % seeds_.size()], {}};
    const int edits = 1 + static_cast<int>(random() % 3);
    for (int e = 0; e < edits; ++e) {
      edit(mutant, random);
    }
    return mutant;
  }

 private:
  std::vector<std::string> seeds_;
  std::uint64_t run_seed_;

  using Random = std::mt19937_64;

  static std::size_t pick(Random& random, std::size_t count) {
    return count == 0 ? 0 : static_cast<std::size_t>(random() % count);
  }

  static std::vector<std::string> lines_of(const std::string& text) {
    std::vector<std::string> lines;
    std::size_t start = 0;
    while (start <= text.size()) {
      const std::size_t end = text.find('\n', start);
      lines.push_back(
          text.substr(start, end == std::string::npos ? std::string::npos : end - start));
      if (end == std::string::npos) {
        break;
      }
      start = end + 1;
    }
    return lines;
  }

  static std::string joined(const std::vector<std::string>& lines) {
    std::string text;
    for (std::size_t i = 0; i < lines.size(); ++i) {
      text += lines[i];
      if (i + 1 < lines.size()) {
        text += '\n';
      }
    }
    return text;
  }

  // Lines of the form `key = value`, by index.
  static std::vector<std::size_t> value_lines(const std::vector<std::string>& lines) {
    std::vector<std::size_t> found;
    for (std::size_t i = 0; i < lines.size(); ++i) {
      const std::size_t equals = lines[i].find('=');
      if (equals != std::string::npos && lines[i].find('#') > equals && lines[i][0] != '[') {
        found.push_back(i);
      }
    }
    return found;
  }

  // Replaces the value of a random `key = value` line.
  static bool replace_value(std::vector<std::string>& lines, const std::string& value,
                            Random& random) {
    const std::vector<std::size_t> candidates = value_lines(lines);
    if (candidates.empty()) {
      return false;
    }
    std::string& line = lines[candidates[pick(random, candidates.size())]];
    line = line.substr(0, line.find('=') + 1) + " " + value;
    return true;
  }

  // One of the '|'-separated choices.
  static std::string one_of(Random& random, std::string_view choices) {
    std::vector<std::string> parts;
    std::size_t start = 0;
    while (true) {
      const std::size_t bar = choices.find('|', start);
      parts.emplace_back(choices.substr(start, bar == std::string_view::npos ? bar : bar - start));
      if (bar == std::string_view::npos) {
        return parts[pick(random, parts.size())];
      }
      start = bar + 1;
    }
  }

  static std::string extreme_number(Random& random) {
    return one_of(random,
                  "1e308|-1e308|1.7976931348623157e308|5e-324|-5e-324|1e-320|0|-0.0|0.0|"
                  "9223372036854775807|-9223372036854775808|nan|-nan|inf|-inf|1e-9|1e9|1e-4|"
                  "1e7|1e-5|-1|-1e-300|0.5|1|2|1000001|0x7fffffff|1e400|3|100|1e-300|"
                  "999999.999999");
  }

  static std::string wrong_type(Random& random) {
    return one_of(random,
                  "\"x\"|true|[1, 2]|{ a = 1 }|1979-05-27|07:32:00|[]|[[0, 0], [1, -1]]|\"\"|{}|"
                  "[\"a\", 1]|'literal'|\"\"\"multi\nline\"\"\"|[true]|\"layer.base.thickness\"|"
                  "[0.1, 0.2, 0.3]|\"strip\"|\"disk\"");
  }

  static std::string control_text(Random& random) {
    return one_of(random,
                  "\"a\\u0007b\"|\"\\u001b[31mred\\u001b[0m\"|\"nul\\u0000cut\"|\"tab\\tname\"|"
                  "\"line\\nbreak\"|\"\\u202Eevil\"|\"\\u0085next\"|\"\\u007f\"|\"film\\u200B\"|"
                  "\"back\\\\slash\"");
  }

  static std::string huge_value(Random& random) {
    const std::size_t length = 1000 + pick(random, 60000);
    switch (pick(random, 4)) {
      case 0:
        return "\"" + std::string(length, 'a') + "\"";
      case 1:
        return "\"" + std::string(length / 10, '-') + "\"";
      case 2: {
        std::string array = "[";
        for (std::size_t i = 0; i < length / 4; ++i) {
          array += (i > 0 ? ", " : "") + std::to_string(i % 7 + 1);
        }
        return array + "]";
      }
      default: {
        std::string array = "[";
        for (std::size_t i = 0; i < length / 8; ++i) {
          array += (i > 0 ? ", " : "") + std::string("[") + std::to_string(i) + ", -" +
                   std::to_string(i) + "]";
        }
        return array + "]";
      }
    }
  }

  static std::string deep_text(Random& random) {
    const std::size_t depth = 10 + pick(random, 60000);
    std::string text;
    switch (pick(random, 5)) {
      case 0:  // a dotted key
        for (std::size_t i = 0; i < depth; ++i) {
          text += (i > 0 ? "." : "") + std::string("a");
        }
        return text + " = 1";
      case 1:  // a table header
        text = "[";
        for (std::size_t i = 0; i < depth; ++i) {
          text += (i > 0 ? ".k" : "k");
        }
        return text + "]";
      case 2:  // nested arrays
        return "x = " + std::string(depth, '[') + std::string(depth, ']');
      case 3:  // nested inline tables
        for (std::size_t i = 0; i < depth; ++i) {
          text += "{a=";
        }
        return "x = " + text + "1" + std::string(depth, '}');
      default:  // a deep variant set
        text = "[[variant]]\nname = \"deep\"\nset = ";
        for (std::size_t i = 0; i < depth % 40; ++i) {
          text += "{ layer = ";
        }
        return text + "1" + std::string(depth % 40, '}');
    }
  }

  // Many copies of a table: a flood of layers, defects or variants.
  static std::string flood(const std::vector<std::string>& lines, Random& random) {
    const std::size_t copies = 20 + pick(random, 3000);
    std::string block;
    switch (pick(random, 3)) {
      case 0:
        block = "\n[[layer]]\nname = \"l\"\nrole = \"other\"\nmaterial = \"gold\"\nthickness = 1.0";
        break;
      case 1:
        block = "\n[[defect]]\nkind = \"slit\"\nlayer = \"l\"\nsize = 1.0";
        break;
      default:
        block = "\n[[variant]]\nname = \"v\"";
        break;
    }
    std::string text = joined(lines);
    for (std::size_t i = 0; i < copies; ++i) {
      text += block;
      if (pick(random, 2) == 0) {
        text += std::to_string(i);  // distinct names for some of them
      }
    }
    return text;
  }

  static std::string raw_byte(Random& random) {
    static const std::vector<std::string> bytes = {
        std::string(1, '\0'), "\x07", "\x1b[2J", "\xff",        "\xc3",
        "\xed\xa0\x80",       "\r",   "\x7f",    "\xe2\x80\xae"};
    return bytes[pick(random, bytes.size())];
  }

  void edit(Mutant& mutant, Random& random) const {
    std::vector<std::string> lines = lines_of(mutant.text);
    const std::size_t at = pick(random, lines.size());
    switch (pick(random, 13)) {
      case 0:
        lines.erase(lines.begin() + static_cast<long>(at));
        mutant.edits.push_back("delete line " + std::to_string(at + 1));
        break;
      case 1:
        lines.insert(lines.begin() + static_cast<long>(at), lines[at]);
        mutant.edits.push_back("duplicate line " + std::to_string(at + 1));
        break;
      case 2: {
        const std::size_t other = pick(random, lines.size());
        std::swap(lines[at], lines[other]);
        mutant.edits.push_back("swap lines " + std::to_string(at + 1) + " and " +
                               std::to_string(other + 1));
        break;
      }
      case 3:
      case 4: {
        const std::string value = extreme_number(random);
        if (replace_value(lines, value, random)) {
          mutant.edits.push_back("a value becomes " + value);
        }
        break;
      }
      case 5: {
        const std::string value = wrong_type(random);
        if (replace_value(lines, value, random)) {
          mutant.edits.push_back("a value becomes " + value);
        }
        break;
      }
      case 6: {
        const std::string value = control_text(random);
        if (replace_value(lines, value, random)) {
          mutant.edits.push_back("a value becomes " + value);
        }
        break;
      }
      case 7:
        if (replace_value(lines, huge_value(random), random)) {
          mutant.edits.push_back("a value becomes huge");
        }
        break;
      case 8:
        lines.insert(lines.begin() + static_cast<long>(at), deep_text(random));
        mutant.edits.push_back("deep nesting at line " + std::to_string(at + 1));
        break;
      case 9:
        mutant.text = flood(lines, random);
        mutant.edits.push_back("a flood of tables");
        return;
      case 10: {
        const std::vector<std::string> donor = lines_of(seeds_[pick(random, seeds_.size())]);
        lines.insert(lines.begin() + static_cast<long>(at), donor[pick(random, donor.size())]);
        mutant.edits.push_back("a line of another case at line " + std::to_string(at + 1));
        break;
      }
      case 11: {
        std::string& line = lines[at];
        line.insert(pick(random, line.size() + 1), raw_byte(random));
        mutant.edits.push_back("a raw byte in line " + std::to_string(at + 1));
        break;
      }
      default: {
        std::string& line = lines[at];
        if (!line.empty()) {
          line[pick(random, line.size())] = "=[]\"{}.,#0-e"[pick(random, 12)];
        }
        mutant.edits.push_back("a character changed in line " + std::to_string(at + 1));
        break;
      }
    }
    mutant.text = joined(lines);
  }
};

}  // namespace plystrain::fuzz
