// Edit distance for "did you mean" hints on misspelt keys and names.
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace plystrain {

// Levenshtein distance (insertions, deletions, substitutions, each cost 1).
[[nodiscard]] int edit_distance(std::string_view a, std::string_view b);

// The candidate nearest to `word`, if it is close enough to be a plausible
// misspelling (distance at most a third of the longer word, at least 1, at
// most 3); otherwise an empty string.
[[nodiscard]] std::string closest_match(std::string_view word,
                                        const std::vector<std::string>& candidates);

}  // namespace plystrain
