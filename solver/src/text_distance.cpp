#include "plystrain/solver/text_distance.hpp"

#include <algorithm>
#include <numeric>

namespace plystrain {

int edit_distance(std::string_view a, std::string_view b) {
  std::vector<int> previous(b.size() + 1);
  std::vector<int> current(b.size() + 1);
  std::iota(previous.begin(), previous.end(), 0);
  for (std::size_t i = 1; i <= a.size(); ++i) {
    current[0] = static_cast<int>(i);
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const int substitution = previous[j - 1] + (a[i - 1] == b[j - 1] ? 0 : 1);
      current[j] = std::min({previous[j] + 1, current[j - 1] + 1, substitution});
    }
    std::swap(previous, current);
  }
  return previous[b.size()];
}

std::string closest_match(std::string_view word, const std::vector<std::string>& candidates) {
  std::string best;
  int best_distance = 0;
  // At most 3 edits are ever accepted, and the lengths alone bound the
  // distance from below: skipping far longer or shorter candidates keeps a
  // megabyte-long misspelling from costing seconds.
  constexpr std::size_t most_edits = 3;
  for (const std::string& candidate : candidates) {
    const std::size_t gap = word.size() > candidate.size() ? word.size() - candidate.size()
                                                           : candidate.size() - word.size();
    if (gap > most_edits) {
      continue;
    }
    const int distance = edit_distance(word, candidate);
    if (best.empty() || distance < best_distance) {
      best = candidate;
      best_distance = distance;
    }
  }
  const int longer = static_cast<int>(std::max(word.size(), best.size()));
  const int allowed = std::clamp(longer / 3, 1, static_cast<int>(most_edits));
  return (!best.empty() && best_distance <= allowed) ? best : std::string{};
}

}  // namespace plystrain
