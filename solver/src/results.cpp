#include "plystrain/solver/results.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

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

const char* verdict_text(Verdict verdict) {
  switch (verdict) {
    case Verdict::intact:
      return "intact";
    case Verdict::yields:
      return "yields";
    case Verdict::cracks:
      return "CRACKS";
    case Verdict::unknown:
      return "no limit data";
  }
  return "no limit data";
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
  governing.yield_margin = smaller(governing.yield_margin, other.yield_margin);
  governing.crack_onset_load_factor =
      smaller(governing.crack_onset_load_factor, other.crack_onset_load_factor);
  governing.yield_load_factor = smaller(governing.yield_load_factor, other.yield_load_factor);
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

Verdict overall_verdict(const RunResults& run) {
  Verdict overall = Verdict::unknown;
  for (const LayerResult& layer : governing_layers(run)) {
    overall = worse(overall, layer.verdict);
  }
  return overall;
}

namespace {

std::string count_of_layers(std::size_t count) {
  return std::to_string(count) + (count == 1 ? " layer" : " layers");
}

std::string joined(const std::vector<std::string>& names) {
  std::string text;
  for (const std::string& name : names) {
    text += (text.empty() ? "" : ", ") + name;
  }
  return text;
}

std::string load_percent(double load_factor) {
  char buffer[64];
  std::snprintf(buffer, sizeof buffer, "%.4g", 100.0 * load_factor);
  return buffer;
}

}  // namespace

std::string headline(const RunResults& run) {
  const std::vector<LayerResult> layers = governing_layers(run);
  std::vector<std::string> cracking;
  std::vector<std::string> yielding;
  std::vector<std::string> intact;
  std::vector<std::string> without_limits;
  for (const LayerResult& layer : layers) {
    switch (layer.verdict) {
      case Verdict::cracks:
        cracking.push_back(layer.name);
        break;
      case Verdict::yields:
        yielding.push_back(layer.name);
        break;
      case Verdict::intact:
        intact.push_back(layer.name);
        break;
      case Verdict::unknown:
        without_limits.push_back(layer.name);
        break;
    }
  }
  const std::string total = std::to_string(layers.size());
  std::vector<std::string> parts;
  // The first part names the total ("2 of 4 layers crack"); later parts
  // count against it.
  const auto counted = [&](const std::vector<std::string>& names, const char* one,
                           const char* several) {
    const std::string verb = names.size() == 1 ? one : several;
    if (parts.empty()) {
      parts.push_back(std::to_string(names.size()) + " of " + total +
                      (layers.size() == 1 ? " layer " : " layers ") + verb + ": " + joined(names));
    } else {
      parts.push_back(std::to_string(names.size()) + " " + verb + ": " + joined(names));
    }
  };
  if (!cracking.empty()) {
    counted(cracking, "cracks", "crack");
  }
  if (!yielding.empty()) {
    counted(yielding, "yields", "yield");
  }
  if (cracking.empty() && yielding.empty() && !intact.empty()) {
    parts.push_back(intact.size() == layers.size() && layers.size() > 1
                        ? "all " + total + " layers intact"
                        : std::to_string(intact.size()) + " of " + count_of_layers(layers.size()) +
                              " intact");
  }
  if (!without_limits.empty()) {
    parts.push_back(count_of_layers(without_limits.size()) +
                    " without limit data: " + joined(without_limits));
  }
  if (layers.empty()) {
    parts.push_back("no layers evaluated");
  }
  parts.push_back(run.completed ? "load reached " + load_percent(run.load_reached) + " %"
                                : "load stopped at " + load_percent(run.load_reached) +
                                      " %; the verdicts are for that state");
  std::string text;
  for (const std::string& part : parts) {
    text += (text.empty() ? "" : "; ") + part;
  }
  return text;
}

}  // namespace plystrain
