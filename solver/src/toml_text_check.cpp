#include "plystrain/solver/toml_text_check.hpp"

#include "plystrain/solver/case_limits.hpp"
#include "plystrain/solver/input_text.hpp"

#include <vector>

namespace plystrain {

namespace {

// file:line:column of a byte offset, counting characters, not bytes.
SourceLocation location_at(std::string_view text, std::size_t offset, const std::string& file) {
  int line = 1;
  int column = 1;
  for (std::size_t i = 0; i < offset && i < text.size(); ++i) {
    if (text[i] == '\n') {
      ++line;
      column = 1;
    } else if ((static_cast<unsigned char>(text[i]) & 0xC0) != 0x80) {
      ++column;
    }
  }
  return SourceLocation{file, line, column};
}

// The offset of the first byte that makes `text` not UTF-8 text, and why.
std::optional<std::pair<std::size_t, std::string>> encoding_problem(std::string_view text) {
  using Status = Utf8Character::Status;
  std::size_t at = 0;
  while (at < text.size()) {
    if (text[at] == '\0') {
      return std::pair{at, std::string("the file is not text: it holds a NUL byte")};
    }
    const Utf8Character character = decode_utf8(text, at);
    switch (character.status) {
      case Status::ok:
        break;
      case Status::bad_byte:
        return std::pair{at, std::string("the file is not valid UTF-8 text")};
      case Status::cut_off:
        return std::pair{at,
                         std::string("the file is not valid UTF-8 text (a character is cut off)")};
      case Status::invalid_code:
        return std::pair{at,
                         std::string("the file is not valid UTF-8 text (an invalid character)")};
    }
    at += character.length;
  }
  return std::nullopt;
}

// Follows the nesting of a TOML text: table headers, dotted keys, arrays
// and inline tables. Linear in the text, with no recursion of its own.
class NestingScan {
 public:
  explicit NestingScan(std::string_view text) : text_(text) {}

  // The offset where the nesting first passes limits::nesting_depth.
  std::optional<std::size_t> too_deep() {
    while (at_ < text_.size()) {
      if (const std::optional<std::size_t> deep = step()) {
        return deep;
      }
    }
    return std::nullopt;
  }

 private:
  std::string_view text_;
  std::size_t at_ = 0;
  int header_depth_ = 0;          // parts of the last [table] header
  std::vector<int> open_depths_;  // depth of each open array or inline table
  std::vector<char> open_kinds_;  // '[' or '{'
  int open_value_depth_ = 0;      // depth of the value being read
  bool in_key_ = true;            // reading a key (else a value)
  bool line_start_ = true;        // nothing but blanks yet on this line, outside brackets
  int key_parts_ = 1;

  [[nodiscard]] int enclosing_depth() const {
    return open_depths_.empty() ? header_depth_ : open_depths_.back();
  }

  std::optional<std::size_t> check(int depth, std::size_t where) const {
    return depth > limits::nesting_depth ? std::optional<std::size_t>(where) : std::nullopt;
  }

  void start_key() {
    in_key_ = true;
    key_parts_ = 1;
  }

  std::optional<std::size_t> step() {
    const char c = text_[at_];
    if (c == '"' || c == '\'') {
      skip_string(c);
      line_start_ = false;
      return std::nullopt;
    }
    if (c == '#') {
      while (at_ < text_.size() && text_[at_] != '\n') {
        ++at_;
      }
      return std::nullopt;
    }
    const std::size_t here = at_++;
    if (c == '\n') {
      if (open_kinds_.empty()) {
        start_key();
        line_start_ = true;
      }
      return std::nullopt;
    }
    if (c == ' ' || c == '\t' || c == '\r') {
      return std::nullopt;
    }
    const bool first = line_start_;
    line_start_ = false;
    if (first && c == '[' && open_kinds_.empty()) {
      return header(here);
    }
    return in_key_ ? key_character(c, here) : value_character(c, here);
  }

  std::optional<std::size_t> header(std::size_t start) {
    int parts = 1;
    while (at_ < text_.size() && text_[at_] != '\n' && text_[at_] != ']') {
      const char c = text_[at_];
      if (c == '"' || c == '\'') {
        skip_string(c);
        continue;
      }
      parts += c == '.' ? 1 : 0;
      ++at_;
    }
    header_depth_ = parts;
    return check(parts, start);
  }

  std::optional<std::size_t> key_character(char c, std::size_t here) {
    if (c == '.') {
      ++key_parts_;
      return check(enclosing_depth() + key_parts_, here);
    }
    if (c == '=') {
      in_key_ = false;
      open_value_depth_ = enclosing_depth() + key_parts_;
      return check(open_value_depth_, here);
    }
    if (c == '}' || c == ',') {
      return value_character(c, here);  // an empty inline table, or a stray comma
    }
    return std::nullopt;
  }

  std::optional<std::size_t> value_character(char c, std::size_t here) {
    if (c == '[' || c == '{') {
      const int depth = (open_kinds_.empty() || open_kinds_.back() == '{' ? open_value_depth_
                                                                          : enclosing_depth()) +
                        1;
      open_kinds_.push_back(c);
      open_depths_.push_back(depth);
      if (c == '{') {
        start_key();
      }
      return check(depth, here);
    }
    if ((c == ']' || c == '}') && !open_kinds_.empty()) {
      open_kinds_.pop_back();
      open_depths_.pop_back();
      in_key_ = false;
      return std::nullopt;
    }
    if (c == ',' && !open_kinds_.empty() && open_kinds_.back() == '{') {
      start_key();
    }
    return std::nullopt;
  }

  // Moves past a string that starts at at_ (basic or literal, one line or
  // multi-line); an unterminated one runs to the end of its line or the file.
  void skip_string(char quote) {
    const bool multi = text_.substr(at_, 3) == std::string(3, quote);
    at_ += multi ? 3 : 1;
    while (at_ < text_.size()) {
      const char c = text_[at_];
      if (c == '\\' && quote == '"') {
        at_ += 2;
        continue;
      }
      if (!multi && c == '\n') {
        return;
      }
      if (c == quote && (!multi || text_.substr(at_, 3) == std::string(3, quote))) {
        at_ += multi ? 3 : 1;
        return;
      }
      ++at_;
    }
  }
};

}  // namespace

std::optional<InputProblem> toml_text_problem(std::string_view text, const std::string& file) {
  if (text.size() > limits::case_file_bytes) {
    return InputProblem{location_at(text, limits::case_file_bytes, file), "",
                        "expected a file of at most " + grouped_count(limits::case_file_bytes) +
                            " bytes (1 MiB), found more: the limit is passed here"};
  }
  if (const auto problem = encoding_problem(text)) {
    return InputProblem{location_at(text, problem->first, file), "", problem->second};
  }
  if (const std::optional<std::size_t> deep = NestingScan(text).too_deep()) {
    return InputProblem{location_at(text, *deep, file), "",
                        "expected tables, dotted keys, arrays and inline tables nested at most " +
                            std::to_string(limits::nesting_depth) +
                            " levels deep, found deeper nesting here"};
  }
  return std::nullopt;
}

}  // namespace plystrain
