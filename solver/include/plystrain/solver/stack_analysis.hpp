// Stack analyses: from a checked case and its mesh to the model definitions
// of each solve (stretch; bend to one or more radii; conform), and from a solved state
// to the per-layer verdicts, profiles and field snapshots of results-format.md.
// No files and no terminal here: the run pipeline does those.
#pragma once

#include "plystrain/mesh/mesh.hpp"
#include "plystrain/solver/case_spec.hpp"
#include "plystrain/nonlinear/load_stepper.hpp"
#include "plystrain/solver/model.hpp"
#include "plystrain/solver/post.hpp"
#include "plystrain/solver/results.hpp"

#include <optional>
#include <string>
#include <vector>

namespace plystrain {

// One solve of a case: bend with several radii makes one per radius.
struct LoadCase {
  std::string label;  // "" for a single solve, e.g. "radius 25000 um" otherwise
  double bend_radius = 0.0;  // um, bend only
  solver::ModelDefinition definition;
  nonlinear::LoadStepperOptions stepper;
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

// The undisturbed state of a case: the same stack without its defects under
// the same load. Stretch and bend leave it uniform along x (a laminate
// state), so any of its points stands for any place; a conform device's
// varies along the radius.
struct UndisturbedState {
  solver::PointResults points;
  bool uniform_along_x = true;
};

// The case whose solution is the undisturbed state of `spec` at load factor
// `load_factor` (the load scaled back for a run that stopped early):
// without defects; for stretch and bend a narrow cell, since the laminate
// state does not vary along x. Empty when the load cannot be scaled (a wrap
// that stopped early).
[[nodiscard]] std::optional<CaseSpec> undisturbed_case(const CaseSpec& spec, double load_factor);

// Per-layer evaluation of one solved state (results-format.md "Per layer"):
// the peak is the largest disc average over report.averaging_radius;
// `far_field_strain` and `concentration` come from the undisturbed state at
// the peak's place (left empty without one); `strain_at_cell_edge` is the
// largest strain of the layer in the outer part of the modelled width.
[[nodiscard]] std::vector<LayerResult> evaluate_layers(const CaseSpec& spec,
                                                       const solver::PointResults& points,
                                                       const UndisturbedState* undisturbed);

// One caution per layer whose averaged and raw peaks disagree about its
// verdict (crack or yield): the averaging radius then decides the verdict,
// and a reader must know it.
[[nodiscard]] std::vector<std::string> averaging_cautions(const CaseSpec& spec,
                                                          const std::vector<LayerResult>& layers);

// How far along x (or r) the evaluation reaches (the whole width: the loaded
// edges are consistent with the homogeneous or pure-bending state).
[[nodiscard]] double evaluated_extent(const CaseSpec& spec);

// The outer part of the evaluated extent where `strain_at_cell_edge` is
// read: from this fraction of it outwards.
inline constexpr double edge_zone_fraction = 0.95;
[[nodiscard]] double cell_edge_zone_start(const CaseSpec& spec);

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
