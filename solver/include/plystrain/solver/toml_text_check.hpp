// Checks of the raw text of a TOML file (a case or a material file) before
// the parser sees it. The parser builds one table per part of a dotted key
// or header and recurses through them: a key 50,000 parts deep exhausts the
// stack inside it, so nesting is measured here, by a scan that only follows
// strings, comments and brackets (and never fails: syntax is the parser's
// business). Linear in the text.
#pragma once

#include "plystrain/solver/input_error.hpp"

#include <optional>
#include <string>
#include <string_view>

namespace plystrain {

// What makes `text` (the content of `file`) unfit to be parsed at all: more
// than limits::case_file_bytes, not UTF-8 text (or a NUL byte), or nested
// deeper than limits::nesting_depth. The problem names the line and column.
[[nodiscard]] std::optional<InputProblem> toml_text_problem(std::string_view text,
                                                            const std::string& file);

}  // namespace plystrain
