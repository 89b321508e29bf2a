// How far a defect disturbs the strain of a bonded stack, estimated from the
// stack alone, so that a model can be made wide enough for the defect to be
// isolated (and a user's narrower width can be named for what it is: a row
// of defects at twice that spacing).
//
// A thin stiff film bonded to compliant layers picks its load back up from
// them over a load-transfer length. On a deep compliant neighbour the
// neighbour's stiffness over a length L scales as Ebar_n / L, so the film's
// force balance Ebar_f h_f u'' = k u gives L ~ Ebar_f h_f / Ebar_n; a
// neighbour thinner than that acts as a shear layer, k = G_n / h_n, and
// L = sqrt(Ebar_f h_f h_n / G_n) (shear lag; Hutchinson & Suo, Adv. Appl.
// Mech. 29, 1992, section 4, treat the same balance for film cracking).
// These are order-of-magnitude estimates: the run measures afterwards how
// far the defect's disturbance really reached (the strain at the cell edge
// against the undisturbed state) and says so when it reached the edge.
#pragma once

#include "plystrain/solver/case_spec.hpp"

namespace plystrain {

// Lengths in micrometres.
struct StackScales {
  double transfer_length = 0.0;  // longest load-transfer length of a stiff group of layers
  double thickness = 0.0;        // the whole stack
  // The distance over which a disturbance is taken to have died out (to
  // about 5 %): three transfer lengths, and never less than three stack
  // thicknesses.
  [[nodiscard]] double decay_length() const;
};

[[nodiscard]] StackScales stack_scales(const std::vector<LayerSpec>& layers,
                                       const MaterialLibrary& library);

// How far from the axis / symmetry plane the defect itself reaches:
// |at| + size / 2, plus a thin spot's taper.
[[nodiscard]] double defect_outer_edge(const DefectSpec& defect);

// How far from the axis / symmetry plane a defect's disturbance reaches:
// its outer edge (|at| + size / 2, plus a thin spot's taper) plus the
// stack's decay length.
[[nodiscard]] double zone_of_influence(const DefectSpec& defect, const StackScales& scales);

// The width the case format chooses when the user gives none: it covers
// each defect's zone of influence twice over beyond the defect's edge (twice
// the decay length when there are no defects, where the width only sets how
// far the cut edge is from where the strains are read).
[[nodiscard]] double default_width(const std::vector<DefectSpec>& defects,
                                   const StackScales& scales);

}  // namespace plystrain
