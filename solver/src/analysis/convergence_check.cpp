#include "plystrain/solver/convergence_check.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

namespace plystrain {

std::vector<ConvergenceRerunPlan> convergence_reruns(const CaseSpec& spec) {
  CaseSpec base = spec;
  base.variants.clear();
  base.sweep.reset();
  base.report.verify.value = false;
  // Derived sizes are written into the reruns as given, so that each rerun
  // changes exactly one choice.
  base.mesh.size_near.given = true;
  base.mesh.size_far.given = true;
  base.mesh.grade_over.given = true;
  base.report.averaging_radius.given = true;

  std::vector<ConvergenceRerunPlan> plans;
  // Both sizes: size_near sets the cells at the defects, size_far also the
  // number of cells through each thick layer, whose outermost integration
  // points carry a bent layer's largest strain.
  CaseSpec finer = base;
  finer.mesh.size_near.value *= 0.5;
  finer.mesh.size_far.value *= 0.5;
  plans.push_back({"mesh halved (near the defects and far from them)", "verify-mesh", finer});

  if (spec.load.kind.value != LoadKind::conform && !spec.geometry.defect_spacing.given) {
    CaseSpec wider = base;
    wider.geometry.width.value *= 2.0;
    wider.geometry.width.given = true;
    plans.push_back({"width doubled", "verify-width", wider});
  }
  return plans;
}

ConvergenceReport compare_reruns(const RunResults& run,
                                 const std::vector<ConvergenceRerunPlan>& plans,
                                 const std::vector<RunResults>& reruns) {
  ConvergenceReport report;
  report.tolerance = convergence_tolerance;
  const std::vector<LayerResult> reference = governing_layers(run);
  std::string moved;
  bool all_completed = true;
  for (std::size_t i = 0; i < plans.size() && i < reruns.size(); ++i) {
    ConvergenceRerun rerun;
    rerun.what = plans[i].what;
    rerun.folder = plans[i].folder;
    rerun.completed = reruns[i].completed;
    all_completed = all_completed && rerun.completed;
    const std::vector<LayerResult> other = governing_layers(reruns[i]);
    for (const LayerResult& layer : reference) {
      const auto found = std::find_if(other.begin(), other.end(),
                                      [&](const LayerResult& o) { return o.name == layer.name; });
      if (found == other.end()) {
        continue;
      }
      PeakChange change;
      change.layer = layer.name;
      change.peak = layer.peak_strain;
      change.rerun_peak = found->peak_strain;
      // Relative to the peak, or to 1e-6 strain for a layer that is hardly
      // strained at all.
      change.change = std::abs(found->peak_strain - layer.peak_strain) /
                      std::max(std::abs(layer.peak_strain), 1e-6);
      if (change.change > rerun.largest_change) {
        rerun.largest_change = change.change;
      }
      if (change.change > report.tolerance) {
        char text[160];
        std::snprintf(text, sizeof text, "%s%s %.1f %% (%s)", moved.empty() ? "" : ", ",
                      layer.name.c_str(), 100.0 * change.change, rerun.what.c_str());
        moved += text;
      }
      rerun.layers.push_back(change);
    }
    report.reruns.push_back(std::move(rerun));
  }
  double largest = 0.0;
  for (const ConvergenceRerun& rerun : report.reruns) {
    largest = std::max(largest, rerun.largest_change);
  }
  char percent[64];
  std::snprintf(percent, sizeof percent, "%.0f %%", 100.0 * report.tolerance);
  char largest_text[64];
  std::snprintf(largest_text, sizeof largest_text, "%.2f %%", 100.0 * largest);
  report.converged = all_completed && moved.empty();
  if (!all_completed) {
    report.verdict = "not confirmed: a rerun did not reach the full load";
  } else if (report.converged) {
    report.verdict =
        std::string("converged within ") + percent + ": no peak moved by more than " + largest_text;
  } else {
    report.verdict = std::string("not converged within ") + percent + ": " + moved;
  }
  return report;
}

}  // namespace plystrain
