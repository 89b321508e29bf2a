// Text taken from a user's file and shown back in a message. A name can hold
// a terminal escape, a bell or a NUL, and a value can be megabytes long:
// echoed raw, the first would act on the user's terminal and the second
// would bury the message. Everything echoed goes through these.
#pragma once

#include <cstddef>
#include <string>
#include <string_view>

namespace plystrain {

// Characters past this many are left out of an echo.
inline constexpr std::size_t echo_keep = 60;
// A text up to this long is echoed whole.
inline constexpr std::size_t echo_whole = 80;

// One character of UTF-8 text at a byte offset: its code point and length
// in bytes, or why the bytes there are not a character (then length 1).
struct Utf8Character {
  enum class Status { ok, bad_byte, cut_off, invalid_code };
  char32_t code = 0;
  std::size_t length = 1;
  Status status = Status::bad_byte;
};
[[nodiscard]] Utf8Character decode_utf8(std::string_view text, std::size_t at);

// Whether the UTF-8 code point `code` is a control or formatting character
// that must not reach a terminal: C0 controls, DEL, C1 controls, and the
// invisible marks and bidirectional overrides that reorder what is shown.
[[nodiscard]] bool is_control_character(char32_t code);

// Whether `text` holds a control character (as above) or a byte that is not
// valid UTF-8.
[[nodiscard]] bool has_control_characters(std::string_view text);

// `text` with each control character written as \u001B (\u202E, ...) and
// each byte that is not valid UTF-8 as \xFF. Plain text is unchanged.
[[nodiscard]] std::string escape_control_characters(std::string_view text);

// Number of characters (code points; a stray byte counts as one).
[[nodiscard]] std::size_t character_count(std::string_view text);

// `text` escaped, and when longer than `echo_whole` characters its first
// `echo_keep` followed by "… (N characters)".
[[nodiscard]] std::string echoed(std::string_view text);

// echoed() between double quotes, with `"` and `\` escaped as in TOML.
[[nodiscard]] std::string quoted_echo(std::string_view text);

// "1,000,000": counts in messages.
[[nodiscard]] std::string grouped_count(std::size_t count);

}  // namespace plystrain
