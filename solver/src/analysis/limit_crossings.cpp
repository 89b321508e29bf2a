#include "plystrain/solver/limit_crossings.hpp"

#include <algorithm>
#include <cmath>
#include <iterator>

namespace plystrain {

namespace {

// Load factor where the straight line through (f0, p0) and (f1, p1) reaches
// `limit`, for p0 < limit <= p1; clamped to the bracket against rounding.
double interpolate(double f0, double p0, double f1, double p1, double limit) {
  const double rise = p1 - p0;
  const double share = rise > 0.0 ? (limit - p0) / rise : 1.0;
  return f0 + std::clamp(share, 0.0, 1.0) * (f1 - f0);
}

}  // namespace

void LimitCrossings::add(double load_factor, const std::vector<LayerResult>& layers) {
  for (const LayerResult& layer : layers) {
    auto track = std::find_if(tracks_.begin(), tracks_.end(),
                              [&layer](const Track& t) { return t.name == layer.name; });
    if (track == tracks_.end()) {
      tracks_.push_back(Track{layer.name, 0.0, 0.0, std::nullopt, std::nullopt});
      track = std::prev(tracks_.end());
    }
    const double peak = layer.peak_strain;
    if (!std::isfinite(peak)) {
      continue;  // a state that failed to evaluate neither crosses nor moves the bracket
    }
    if (!track->crack_onset && layer.crack_onset_strain && peak >= *layer.crack_onset_strain &&
        track->previous_peak < *layer.crack_onset_strain) {
      track->crack_onset = interpolate(track->previous_load_factor, track->previous_peak,
                                       load_factor, peak, *layer.crack_onset_strain);
    }
    if (!track->yield && layer.yield_strain && peak > *layer.yield_strain &&
        track->previous_peak <= *layer.yield_strain) {
      track->yield = interpolate(track->previous_load_factor, track->previous_peak, load_factor,
                                 peak, *layer.yield_strain);
    }
    track->previous_load_factor = load_factor;
    track->previous_peak = peak;
  }
}

void LimitCrossings::apply_to(std::vector<LayerResult>& layers) const {
  for (LayerResult& layer : layers) {
    const auto track = std::find_if(tracks_.begin(), tracks_.end(),
                                    [&layer](const Track& t) { return t.name == layer.name; });
    if (track != tracks_.end()) {
      layer.crack_onset_load_factor = track->crack_onset;
      layer.yield_load_factor = track->yield;
    }
  }
}

}  // namespace plystrain
