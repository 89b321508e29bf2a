// What a run found, as plain values: the content of results.json,
// summary.txt and profiles.csv (results-format.md, version 1). The writers
// turn these into files; the analyses fill them. Lengths are in the case's
// own unit when written; here they are in micrometres like everything else.
#pragma once

#include <Eigen/Core>

#include <array>
#include <optional>
#include <string>
#include <vector>

namespace plystrain {

enum class Verdict { intact, yields, cracks, unknown };

[[nodiscard]] const char* verdict_name(Verdict verdict);  // "intact", "yields", ...

// The verdict as the human-readable outputs say it: "CRACKS" (the one a
// reader must not overlook), "yields", "intact", and "no limit data" for
// `unknown` (the JSON keeps the enumeration name "unknown").
[[nodiscard]] const char* verdict_text(Verdict verdict);

// The verdict of results-format.md: cracks at or above crack onset, yields
// above the yield strain, unknown when the material has neither limit.
[[nodiscard]] Verdict judge(double peak_strain, const std::optional<double>& crack_onset_strain,
                            const std::optional<double>& yield_strain);

// The worse of two verdicts (cracks > yields > intact; unknown only when both are).
[[nodiscard]] Verdict worse(Verdict a, Verdict b);

struct LayerResult {
  std::string name;
  std::string role;
  std::string material;
  std::string basis;                 // basis of the material's values
  double thickness = 0.0;            // um
  double peak_strain = 0.0;          // averaged over report.averaging_radius
  std::array<double, 2> peak_at{};   // reference coordinates (x or r, z), um
  double raw_peak_strain = 0.0;      // integration-point peak
  // The verdict the raw peak would give. When it differs from `verdict`, the
  // averaging over report.averaging_radius decided the verdict, and the run
  // says so (a caution and results.json's layers[].raw_peak_verdict).
  Verdict raw_peak_verdict = Verdict::unknown;
  // Strain of the undisturbed state (the stack without its defects under
  // the same load) in this layer at the peak's place.
  double far_field_strain = 0.0;
  std::optional<double> concentration;  // peak / far field; null when the far field is below 1e-9
  // Largest strain of the layer in the outer 5 % of the modelled width
  // (disc-averaged like the peak).
  std::optional<double> strain_at_cell_edge;
  double min_strain = 0.0;
  double peak_stress = 0.0;          // MPa, largest principal Cauchy stress at peak_at
  std::optional<double> crack_onset_strain;
  std::optional<double> yield_strain;
  std::optional<double> crack_margin;  // 1 - peak / crack onset
  std::optional<double> yield_margin;  // 1 - peak / yield strain
  // Load factor at which the peak first reaches the crack-onset strain
  // (first exceeds the yield strain), interpolated linearly between the
  // converged increments around it; null when not reached within the load
  // reached. Governing value over several solves: the smallest.
  std::optional<double> crack_onset_load_factor;
  std::optional<double> yield_load_factor;
  Verdict verdict = Verdict::unknown;
};

struct LocalCheck {
  double applied_major = 0.0;
  double applied_minor = 0.0;
  std::array<double, 2> applied_at{};
  int defect_index = 0;  // from 1, as in the case
  std::vector<LayerResult> layers;
};

struct RequiredStrain {
  std::string layer;
  double max = 0.0;
  std::array<double, 2> at{};
  double min = 0.0;
};

struct ConformResult {
  std::string surface;
  std::string method;
  std::vector<RequiredStrain> required_strain;
  double contact_fraction = 0.0;
  double max_penetration = 0.0;  // um, reported against the stated tolerance
};

// How far one defect disturbs the stack (estimated from the stack alone,
// zone_of_influence.hpp) and whether the modelled width covers it.
struct DefectZone {
  int index = 0;                   // from 1, as in the case
  std::string kind;                // as spelt in the case ("slit", "pinhole", ...)
  double zone_of_influence = 0.0;  // um from the axis / symmetry plane
  bool covered = false;            // the modelled width reaches at least that far
};

// The modelled cell: its width, why it is that wide, and how much the
// defects still disturb the strain at its edge.
struct CellFigures {
  double width = 0.0;  // um
  // "given", "isolating" (chosen to cover every zone of influence) or
  // "defect spacing" (a row of defects, stated on purpose).
  std::string width_basis;
  // How far from the axis / symmetry plane the evaluation reaches: the
  // whole width, except for conform, whose rim (a free edge or a clamp,
  // singular) is left out over one stack thickness.
  double evaluated_extent = 0.0;  // um
  // Largest |strain at the cell edge / undisturbed strain - 1| over the
  // layers (stretch and bend with defects); empty where not measured.
  std::optional<double> edge_disturbance;
};

// One rerun of a case with one modelling choice changed, against the run.
struct PeakChange {
  std::string layer;
  double peak = 0.0;        // governing peak strain of the run
  double rerun_peak = 0.0;  // the same of the rerun
  double change = 0.0;      // |rerun / run - 1|
};
struct ConvergenceRerun {
  std::string what;    // "mesh halved (...)", "width doubled"
  std::string folder;  // the rerun's own output folder, relative to the run's
  bool completed = false;
  std::vector<PeakChange> layers;
  double largest_change = 0.0;
};
struct ConvergenceReport {
  double tolerance = 0.02;
  std::vector<ConvergenceRerun> reruns;
  bool converged = false;
  std::string verdict;  // one sentence: "converged within 2 %: ..." or what moved
};

struct MeshFigures {
  int nodes = 0;
  int elements = 0;
  int unknowns = 0;
  double min_quality = 0.0;
};

struct SolverFigures {
  int increments = 0;
  int newton_iterations = 0;
  int cutbacks = 0;
  double seconds = 0.0;
};

struct RunResults {
  int format = 1;
  std::string tool_version;
  std::string case_file;  // file name of the case as given
  std::string case_hash;  // hash of the case as run
  std::string title;
  std::string shape;      // "strip", "disk"
  std::string load;       // "stretch", "bend", "conform"
  std::string lateral;    // "free", "held", a number, or "" where it does not apply
  bool completed = false;
  double load_reached = 0.0;
  std::string message;    // why it stopped early; empty when completed
  std::string interrupted_by;  // what stopped the run ("SIGINT", "SIGTERM"); empty if nothing did
  std::vector<LayerResult> layers;
  std::vector<LocalCheck> local;
  std::optional<ConformResult> conform;
  CellFigures cell;
  std::optional<ConvergenceReport> verification;
  std::vector<DefectZone> defects;
  MeshFigures mesh;
  SolverFigures solver;
  std::vector<std::string> cautions;
};

// Per layer name, in the order of `run.layers` (then any layer only a local
// check names), the governing figures over the global result and every
// local check: the largest peak strain (with its place, far field,
// concentration and stress), the smallest minimum strain and crack margin,
// and the worst verdict. This is the "overall verdict of a layer" of
// results-format.md.
[[nodiscard]] std::vector<LayerResult> governing_layers(const RunResults& run);

// The worst verdict over every governing layer (unknown only when no layer
// has limit data, or there are no layers).
[[nodiscard]] Verdict overall_verdict(const RunResults& run);

// One line a reader takes in at a glance, from the governing layers: how
// many layers crack and yield and which, the layers without limit data, and
// the load reached, e.g. "2 of 4 layers crack: electrode, sensing; load
// reached 100 %". A run that stopped early says at which load and that the
// verdicts are for that state.
[[nodiscard]] std::string headline(const RunResults& run);

// One sample of profiles.csv: strain along a layer's mid-line.
struct ProfileSample {
  std::string layer;
  double x = 0.0;  // reference x or r, um
  double z = 0.0;  // reference z, um
  double strain_along = 0.0;
  double strain_across = 0.0;
  double strain_third = 0.0;
  double max_principal = 0.0;
};

// Nodal fields of one converged increment for the ParaView output. Values
// per layer are kept apart: `point_layer_values` has one row per (node,
// region) pair listed in `point_copies`, so that a node on an interface
// carries one value per layer and nothing is smeared across the interface.
struct FieldSnapshot {
  double load_factor = 0.0;
  Eigen::MatrixX2d displacement;             // per mesh node
  // Per (node, region) copy: the writer duplicates interface nodes so that
  // every layer's cells refer to their own copy.
  std::vector<std::array<int, 2>> point_copies;  // {node, region}
  Eigen::VectorXd max_principal_strain;          // per copy
  Eigen::VectorXd min_principal_strain;
  Eigen::Matrix<double, Eigen::Dynamic, 6> log_strain;     // xx yy zz xy yz xz per copy
  Eigen::Matrix<double, Eigen::Dynamic, 6> cauchy_stress;  // MPa, same order
  Eigen::VectorXd von_mises_stress;
  Eigen::VectorXd crack_ratio;  // max_principal_strain / crack onset (0 where unknown)
};

}  // namespace plystrain
