// The text of materials/library.toml, compiled into the program so that the
// built-in materials need no file at run time. Parsed by the material
// library reader, which names "materials/library.toml" in its errors.
#pragma once

#include <string_view>

namespace plystrain::materials {

// The name errors in the built-in text are reported under.
inline constexpr std::string_view builtin_library_name = "materials/library.toml";

[[nodiscard]] std::string_view builtin_library_text();

}  // namespace plystrain::materials
