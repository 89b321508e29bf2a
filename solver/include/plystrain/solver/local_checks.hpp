// Local defect checks of conform analyses: the global solve is run on the
// defect-free stack, then each defect is analysed in a small cell of the same
// stack stretched by the in-plane strain state the global solve found in the
// defect's layer (at its most strained point, or at `load.local_at`).
//
// The cell: a disk (equibiaxial stretch by the major strain) when the defect
// is circular and the state near-equibiaxial (minor/major >= 0.9), otherwise
// a symmetric strip stretched by the major strain with the minor strain
// imposed across it. Only the membrane state of the defect's layer is
// passed on: the curvature of the device across the cell's width is left
// out, which is a good approximation for a cell much narrower than the
// surface's radius (docs/theory.md).
#pragma once

#include "plystrain/solver/case_spec.hpp"
#include "plystrain/solver/post.hpp"
#include "plystrain/solver/results.hpp"

#include <array>
#include <vector>

namespace plystrain {

// The case with its defects taken away (the global solve of a conform case
// that analyses its defects in local cells).
[[nodiscard]] CaseSpec without_defects(const CaseSpec& spec);

struct LocalCellPlan {
  int defect_index = 0;  // from 1, as in the case
  double major = 0.0;    // in-plane nominal strains that load the cell
  double minor = 0.0;
  std::array<double, 2> at{};  // reference (r, z) where the state was taken, um
  CaseSpec cell;               // a stretch case of the cell, ready to run
};

// Minor over major strain from which a circular defect gets a disk cell.
inline constexpr double equibiaxial_ratio = 0.9;

// In-plane strains (meridional, hoop) of a point of an axisymmetric solve:
// the nominal strain of the reference radial fibre and of the hoop.
[[nodiscard]] std::array<double, 2> in_plane_strains(const solver::PointResult& point);

// One plan per defect of `spec`, from the global points and the per-layer
// results of the defect-free solve.
[[nodiscard]] std::vector<LocalCellPlan> plan_local_cells(const CaseSpec& spec, const solver::PointResults& points,
                                                          const std::vector<LayerResult>& layers);

// The cell for one defect under a given in-plane state (also used by tests
// to compare a local cell with a direct stretch analysis).
[[nodiscard]] CaseSpec local_cell_case(const CaseSpec& spec, std::size_t defect, double major, double minor);

}  // namespace plystrain
