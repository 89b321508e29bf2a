// The material library: the built-in materials/library.toml (compiled into
// the program) with the user's material files merged over it by key.
#pragma once

#include "plystrain/materials/material.hpp"

#include <filesystem>
#include <map>
#include <string>
#include <string_view>
#include <vector>

namespace plystrain {

class MaterialLibrary {
 public:
  MaterialLibrary() = default;
  explicit MaterialLibrary(std::map<std::string, materials::MaterialRecord> records);

  [[nodiscard]] const materials::MaterialRecord* find(std::string_view key) const;
  [[nodiscard]] std::vector<std::string> keys() const;  // sorted
  [[nodiscard]] const std::map<std::string, materials::MaterialRecord>& records() const {
    return records_;
  }
  // The known key nearest to `key` (for "did you mean" hints); empty if none is close.
  [[nodiscard]] std::string closest_key(std::string_view key) const;

 private:
  std::map<std::string, materials::MaterialRecord> records_;
};

// The built-in library alone. Throws InputError if it is malformed (a test
// guards against that).
[[nodiscard]] MaterialLibrary load_builtin_library();

// The built-in library, then each user file in order, a later file winning
// per key. Throws InputError naming file:line:column and key on bad input.
[[nodiscard]] MaterialLibrary load_material_library(
    const std::vector<std::filesystem::path>& user_files);

// Human-readable listings for `plystrain materials [KEY]`.
[[nodiscard]] std::string format_material_table(const MaterialLibrary& library);
[[nodiscard]] std::string format_material_detail(const materials::MaterialRecord& record);

}  // namespace plystrain
