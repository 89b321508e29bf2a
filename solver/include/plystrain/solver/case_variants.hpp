// [[variant]] and [sweep] resolution: each variant or sweep value becomes a
// complete CaseSpec that has passed every check of the reader again.
//
// A variant applies its `set` changes first (defect indices count from 1 in
// the base case), then removes its layers; a defect in a removed layer, and a
// delamination whose interface loses either face, is removed with it. When a change decides which
// keys apply (e.g. load.kind), base keys that no longer apply are dropped.
// Resolved cases carry no variants and no sweep; unless the variant sets
// report.out, each writes into <base out>/<name>.
#pragma once

#include "plystrain/solver/case_spec.hpp"

#include <string>
#include <vector>

namespace plystrain {

struct ResolvedCase {
  std::string name;  // the variant name, or "sweep-<n>" for the n-th sweep value (from 1)
  std::string description;  // "remove top-coat; set layer.x.thickness = 2.0" or "load.strain = 0.1"
  CaseSpec spec;
};

// One entry per [[variant]], in file order. Throws InputError naming the
// variant (and the `set` line when a change is at fault).
[[nodiscard]] std::vector<ResolvedCase> resolve_variants(const CaseSpec& base);

// One entry per sweep value; empty when the case has no [sweep].
[[nodiscard]] std::vector<ResolvedCase> resolve_sweep(const CaseSpec& base);

}  // namespace plystrain
