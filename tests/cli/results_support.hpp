// Look-ups in a run's results.json shared by the end-to-end checks.
#pragma once

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

#include <string>

namespace plystrain::test {

inline const nlohmann::json& layer_named(const nlohmann::json& results, const std::string& name) {
  for (const nlohmann::json& layer : results["layers"]) {
    if (layer["name"] == name) {
      return layer;
    }
  }
  FAIL("no layer " << name << " in the results");
  static const nlohmann::json none;
  return none;
}

inline bool has_caution(const nlohmann::json& results, const std::string& fragment) {
  for (const nlohmann::json& caution : results["cautions"]) {
    if (caution.get<std::string>().find(fragment) != std::string::npos) {
      return true;
    }
  }
  return false;
}

}  // namespace plystrain::test
