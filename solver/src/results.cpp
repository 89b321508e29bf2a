#include "plystrain/solver/results.hpp"

#include <algorithm>
#include <cmath>

namespace plystrain {

const char* verdict_name(Verdict verdict) {
  switch (verdict) {
    case Verdict::intact:
      return "intact";
    case Verdict::yields:
      return "yields";
    case Verdict::cracks:
      return "cracks";
    case Verdict::unknown:
      return "unknown";
  }
  return "unknown";
}

Verdict judge(double peak_strain, const std::optional<double>& crack_onset_strain,
              const std::optional<double>& yield_strain) {
  // A peak that is not a number (a failed evaluation) cannot be judged; it
  // must not pass as intact.
  if (!std::isfinite(peak_strain)) {
    return Verdict::unknown;
  }
  if (!crack_onset_strain && !yield_strain) {
    return Verdict::unknown;
  }
  if (crack_onset_strain && peak_strain >= *crack_onset_strain) {
    return Verdict::cracks;
  }
  if (yield_strain && peak_strain > *yield_strain) {
    return Verdict::yields;
  }
  return Verdict::intact;
}

namespace {

// Severity for `worse`: unknown ranks lowest so that any known verdict wins.
int severity(Verdict verdict) {
  switch (verdict) {
    case Verdict::unknown:
      return 0;
    case Verdict::intact:
      return 1;
    case Verdict::yields:
      return 2;
    case Verdict::cracks:
      return 3;
  }
  return 0;
}

std::optional<double> smaller(const std::optional<double>& a, const std::optional<double>& b) {
  if (!a) {
    return b;
  }
  if (!b) {
    return a;
  }
  return std::min(*a, *b);
}

void merge_into(LayerResult& governing, const LayerResult& other) {
  if (other.peak_strain > governing.peak_strain) {
    governing.peak_strain = other.peak_strain;
    governing.peak_at = other.peak_at;
    governing.far_field_strain = other.far_field_strain;
    governing.concentration = other.concentration;
    governing.peak_stress = other.peak_stress;
  }
  governing.raw_peak_strain = std::max(governing.raw_peak_strain, other.raw_peak_strain);
  governing.min_strain = std::min(governing.min_strain, other.min_strain);
  governing.crack_margin = smaller(governing.crack_margin, other.crack_margin);
  governing.verdict = worse(governing.verdict, other.verdict);
}

}  // namespace

Verdict worse(Verdict a, Verdict b) {
  return severity(a) >= severity(b) ? a : b;
}

std::vector<LayerResult> governing_layers(const RunResults& run) {
  std::vector<LayerResult> governing;
  const auto find = [&governing](const std::string& name) {
    return std::find_if(governing.begin(), governing.end(),
                        [&name](const LayerResult& layer) { return layer.name == name; });
  };
  for (const LayerResult& layer : run.layers) {
    const auto found = find(layer.name);
    if (found == governing.end()) {
      governing.push_back(layer);
    } else {
      merge_into(*found, layer);
    }
  }
  for (const LocalCheck& check : run.local) {
    for (const LayerResult& layer : check.layers) {
      const auto found = find(layer.name);
      if (found == governing.end()) {
        governing.push_back(layer);
      } else {
        merge_into(*found, layer);
      }
    }
  }
  return governing;
}

}  // namespace plystrain
