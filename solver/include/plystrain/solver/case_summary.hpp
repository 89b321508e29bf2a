// The readable summary `plystrain check` prints: the stack bottom to top with
// each material's basis, the defects and the load, in the case's own unit.
#pragma once

#include "plystrain/solver/case_spec.hpp"

#include <string>

namespace plystrain {

[[nodiscard]] std::string format_case_summary(const CaseSpec& spec);

// A length in micrometres shown in the case's unit, e.g. "0.12 um", "150 nm".
[[nodiscard]] std::string format_length(double micrometres, LengthUnit unit);

}  // namespace plystrain
