#include "plystrain/solver/input_text.hpp"

#include <cstdint>

namespace plystrain {

namespace {

void append_hex(std::string& out, std::uint32_t value, int digits) {
  static const char* hex = "0123456789ABCDEF";
  for (int shift = 4 * (digits - 1); shift >= 0; shift -= 4) {
    out += hex[(value >> shift) & 0xFu];
  }
}

// Appends `text` escaped; `quote` also escapes `"` and `\`.
void append_escaped(std::string& out, std::string_view text, bool quote) {
  std::size_t at = 0;
  while (at < text.size()) {
    const Utf8Character character = decode_utf8(text, at);
    if (character.status != Utf8Character::Status::ok) {
      out += "\\x";
      append_hex(out, static_cast<unsigned char>(text[at]), 2);
    } else if (is_control_character(character.code)) {
      out += "\\u";
      append_hex(out, static_cast<std::uint32_t>(character.code), 4);
    } else if (quote && (character.code == '"' || character.code == '\\')) {
      out += '\\';
      out += static_cast<char>(character.code);
    } else {
      out.append(text.substr(at, character.length));
    }
    at += character.length;
  }
}

// The byte offset after the first `count` characters of `text`.
std::size_t offset_of_character(std::string_view text, std::size_t count) {
  std::size_t at = 0;
  for (std::size_t seen = 0; seen < count && at < text.size(); ++seen) {
    at += decode_utf8(text, at).length;
  }
  return at;
}

std::string echo(std::string_view text, bool quote) {
  const std::size_t characters = character_count(text);
  std::string out;
  if (characters <= echo_whole) {
    append_escaped(out, text, quote);
    return out;
  }
  append_escaped(out, text.substr(0, offset_of_character(text, echo_keep)), quote);
  return out + "\u2026 (" + grouped_count(characters) + " characters)";
}

}  // namespace

Utf8Character decode_utf8(std::string_view text, std::size_t at) {
  using Status = Utf8Character::Status;
  const auto byte = static_cast<unsigned char>(text[at]);
  if (byte < 0x80) {
    return {byte, 1, Status::ok};
  }
  std::size_t length = 0;
  char32_t code = 0;
  if ((byte & 0xE0) == 0xC0) {
    length = 2;
    code = byte & 0x1Fu;
  } else if ((byte & 0xF0) == 0xE0) {
    length = 3;
    code = byte & 0x0Fu;
  } else if ((byte & 0xF8) == 0xF0) {
    length = 4;
    code = byte & 0x07u;
  } else {
    return {};
  }
  if (at + length > text.size()) {
    return {0, 1, Status::cut_off};
  }
  for (std::size_t k = 1; k < length; ++k) {
    const auto next = static_cast<unsigned char>(text[at + k]);
    if ((next & 0xC0) != 0x80) {
      return {};
    }
    code = (code << 6) | (next & 0x3Fu);
  }
  constexpr char32_t smallest[] = {0, 0, 0x80, 0x800, 0x10000};
  if (code < smallest[length] || code > 0x10FFFF || (code >= 0xD800 && code <= 0xDFFF)) {
    return {0, 1, Status::invalid_code};
  }
  return {code, length, Status::ok};
}

bool is_control_character(char32_t code) {
  return code < 0x20 || (code >= 0x7F && code <= 0x9F) || code == 0x061C ||
         (code >= 0x200B && code <= 0x200F) || (code >= 0x202A && code <= 0x202E) ||
         (code >= 0x2060 && code <= 0x2069) || code == 0xFEFF;
}

bool has_control_characters(std::string_view text) {
  std::size_t at = 0;
  while (at < text.size()) {
    const Utf8Character character = decode_utf8(text, at);
    if (character.status != Utf8Character::Status::ok || is_control_character(character.code)) {
      return true;
    }
    at += character.length;
  }
  return false;
}

std::string escape_control_characters(std::string_view text) {
  std::string out;
  out.reserve(text.size());
  append_escaped(out, text, false);
  return out;
}

std::size_t character_count(std::string_view text) {
  std::size_t count = 0;
  for (std::size_t at = 0; at < text.size(); at += decode_utf8(text, at).length) {
    ++count;
  }
  return count;
}

std::string echoed(std::string_view text) {
  return echo(text, false);
}

std::string quoted_echo(std::string_view text) {
  return "\"" + echo(text, true) + "\"";
}

std::string grouped_count(std::size_t count) {
  std::string digits = std::to_string(count);
  for (std::size_t i = digits.size(); i > 3; i -= 3) {
    digits.insert(i - 3, ",");
  }
  return digits;
}

}  // namespace plystrain
