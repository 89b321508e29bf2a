// One entry of the material library: a constitutive law plus the failure
// limits and the provenance that reports must show beside every margin.
#pragma once

#include "plystrain/materials/law.hpp"

#include <optional>
#include <string>

namespace plystrain::materials {

struct MaterialRecord {
  std::string key;
  LawParameters law;
  std::optional<double> crack_onset_strain;  // nominal strain, fraction
  std::optional<double> yield_strain;        // nominal strain, fraction
  std::optional<double> density;             // kg/m^3
  std::string notes;
  std::string source;            // published source of the values, or a short reason
  std::string basis;             // "published", "from-memory", "measured", "demo"
  std::string method;            // "tensile", "wrinkling", "film-on-water", "indentation", "datasheet", "assumed"
  std::string tested_thickness;  // e.g. "120 nm"; empty when unknown
  std::string defined_in;        // file the entry was read from (the last one that set it)
};

}  // namespace plystrain::materials
