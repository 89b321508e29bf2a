// Writes a case back as TOML: the case as run (after variants), in the
// user's units. Reading the text back gives the same CaseSpec. Defaults the
// reader filled in are shown as comments.
#pragma once

#include "plystrain/solver/case_spec.hpp"

#include <string>

namespace plystrain {

[[nodiscard]] std::string write_case_toml(const CaseSpec& spec);

}  // namespace plystrain
