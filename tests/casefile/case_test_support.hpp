// Helpers shared by the case-reader tests.
#pragma once

#include "plystrain/solver/case_reader.hpp"
#include "plystrain/solver/input_error.hpp"
#include "plystrain/solver/material_library.hpp"

#include <catch2/catch.hpp>

#include <filesystem>
#include <fstream>
#include <map>
#include <string>

namespace plystrain::test {

inline std::filesystem::path case_data(const std::string& name) {
  return std::filesystem::path(PLYSTRAIN_TEST_DATA_DIR) / "cases" / name;
}

inline std::filesystem::path source_dir() { return std::filesystem::path(PLYSTRAIN_SOURCE_DIR); }

// A small library with some of the built-in keys, so that the reader's tests
// do not depend on the built-in library's contents. The material values are
// not read by the case reader; they are placeholders invented for the tests.
inline MaterialLibrary test_library() {
  std::map<std::string, materials::MaterialRecord> records;
  for (const char* key : {"silicone-10to1", "silicone-soft", "pedot-pss", "p3ht", "pbttt", "silver",
                          "gold", "ito", "parylene-c", "polyimide-foil", "demo-elastomer",
                          "demo-stiff-film", "demo-encapsulant", "zinc-oxide", "tpu-film", "test-extra-film"}) {
    materials::MaterialRecord record;
    record.key = key;
    record.law.kind = materials::ModelKind::neo_hookean;
    record.law.shear_modulus = 1.0;
    record.law.bulk_modulus = 100.0;
    record.basis = "demo";
    record.source = "invented for the reader's tests";
    records.emplace(key, record);
  }
  return MaterialLibrary(std::move(records));
}

inline std::string read_text(const std::filesystem::path& file) {
  std::ifstream stream(file, std::ios::binary);
  return {std::istreambuf_iterator<char>(stream), std::istreambuf_iterator<char>()};
}

// The InputError read_case throws for `file`; fails the test if it reads.
inline InputError input_error_of(const std::filesystem::path& file) {
  try {
    static_cast<void>(read_case(file, test_library()));
  } catch (const InputError& error) {
    return error;
  }
  FAIL("expected an InputError for " << file.string());
  throw std::logic_error("unreachable");
}

inline InputError input_error_of_text(const std::string& text,
                                      const std::string& file = "inline.toml") {
  try {
    static_cast<void>(read_case_text(text, file, test_library()));
  } catch (const InputError& error) {
    return error;
  }
  FAIL("expected an InputError for:\n" << text);
  throw std::logic_error("unreachable");
}

// A valid minimal stack, to which tests append or in which they replace lines.
inline const char* minimal_case() {
  return R"(format = 1

[geometry]
shape = "strip"
width = 100.0

[[layer]]
name = "base"
role = "substrate"
material = "silicone-10to1"
thickness = 50.0

[[layer]]
name = "film"
role = "active"
material = "p3ht"
thickness = 0.1

[load]
kind = "stretch"
strain = 0.1
)";
}

}  // namespace plystrain::test
