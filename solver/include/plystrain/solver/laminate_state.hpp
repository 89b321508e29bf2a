// The undisturbed state of a bonded laminate under a uniform in-plane
// stretch, layer by layer: every layer takes the applied stretch along x
// (and the imposed or common third stretch), and finds its own thickness
// stretch from a traction-free top and bottom (P_zz = 0). This is the state
// far from any defect; its nominal stress P_xx is what the far part of the
// stack carries, and loading a cell's edge with it holds that state there
// whatever the defect takes up.
#pragma once

#include "plystrain/materials/law.hpp"

#include <optional>
#include <vector>

namespace plystrain {

struct LaminateLayer {
  materials::LawParameters law;
  double thickness = 0.0;  // um
};

// How the third direction behaves: strip lateral "free" (a common stretch
// with no net force across it), "held" (1) or imposed, or equibiaxial (the
// hoop stretch of a disk, equal to the in-plane one).
struct ThirdStretch {
  enum class Kind { free, fixed, equibiaxial } kind = Kind::fixed;
  double value = 1.0;  // the stretch for `fixed`
};

struct LaminateState {
  std::vector<double> nominal_stress_xx;  // P_xx per layer, MPa
  std::vector<double> thickness_stretch;  // per layer
  double third_stretch = 1.0;
};

// Empty when Newton does not converge (a law outside its domain). `start`,
// a state at a nearby stretch, is where Newton begins (else each layer's
// volume-keeping guess).
[[nodiscard]] std::optional<LaminateState> stretched_laminate(
    const std::vector<LaminateLayer>& layers, double stretch, const ThirdStretch& third,
    const LaminateState* start = nullptr);

}  // namespace plystrain
