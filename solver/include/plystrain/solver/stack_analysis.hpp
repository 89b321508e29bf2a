// Stack analyses: from a checked case and its mesh to the model definitions
// of each solve (stretch; bend to one or more radii; conform), and from a solved state
// to the per-layer verdicts, profiles and field snapshots of results-format.md.
// No files and no terminal here: the run pipeline does those.
#pragma once

#include "plystrain/mesh/mesh.hpp"
#include "plystrain/solver/case_spec.hpp"
#include "plystrain/solver/load_stepper.hpp"
#include "plystrain/solver/model.hpp"
#include "plystrain/solver/post.hpp"
#include "plystrain/solver/results.hpp"

#include <string>
#include <vector>

namespace plystrain {

// One solve of a case: bend with several radii makes one per radius.
struct LoadCase {
  std::string label;  // "" for a single solve, e.g. "radius 25000 um" otherwise
  double bend_radius = 0.0;  // um, bend only
  solver::ModelDefinition definition;
  solver::LoadStepperOptions stepper;
};

// The node set the analyses add to the mesh to remove rigid motion through
// the thickness: one node on the bottom face, nearest to x = 0.
inline constexpr const char* anchor_node_set = "anchor";

// Adds the anchor node set (and, for a press with a ring inside the rim,
// the "ring-clamp" node set) to `mesh` and returns one LoadCase per solve.
// Throws InputError for a profile surface that cannot be built or a ring
// with no bottom-face node outside it.
[[nodiscard]] std::vector<LoadCase> build_load_cases(const CaseSpec& spec, mesh::Mesh& mesh);

// The modelled kinematics for the report ("free", "held", a number, or "").
[[nodiscard]] std::string lateral_text(const CaseSpec& spec);

// Per-layer evaluation of one solved state (results-format.md "Per layer"):
// the peak is the largest disc average over report.averaging_radius; the far
// field is the peak within the far zone (see far_zone_start()).
[[nodiscard]] std::vector<LayerResult> evaluate_layers(const CaseSpec& spec,
                                                       const solver::PointResults& points);

// How far along x (or r) the evaluation reaches (the whole width: the loaded
// edges are consistent with the homogeneous or pure-bending state).
[[nodiscard]] double evaluated_extent(const CaseSpec& spec);

// Reference x (or r) from which the far zone runs to the evaluated extent: beyond
// every defect by at least grade_over, or the outer tenth of the width when
// the defects leave no room.
[[nodiscard]] double far_zone_start(const CaseSpec& spec);

// Strain along each layer's mid-line: per column of integration points of a
// layer (points sharing x), the point nearest the column's mid-height.
[[nodiscard]] std::vector<ProfileSample> sample_profiles(const CaseSpec& spec,
                                                         const solver::PointResults& points);

// Nodal fields for the ParaView output, recovered per layer.
[[nodiscard]] FieldSnapshot make_field_snapshot(const CaseSpec& spec, const solver::Model& model,
                                                const solver::PointResults& points,
                                                const Eigen::VectorXd& q, double load_factor);

// Combine the evaluations of several solves (bend radii): per layer, the
// largest peak and the most compressive strain over all of them.
[[nodiscard]] std::vector<LayerResult> envelope(const std::vector<std::vector<LayerResult>>& runs);

}  // namespace plystrain
