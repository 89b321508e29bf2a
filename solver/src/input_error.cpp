#include "plystrain/solver/input_error.hpp"

#include "plystrain/solver/input_text.hpp"

#include <algorithm>
#include <cctype>
#include <map>
#include <sstream>
#include <utility>

namespace plystrain {

std::string SourceLocation::to_string() const {
  std::ostringstream text;
  text << (file.empty() ? "<input>" : file);
  if (line > 0) {
    text << ':' << line;
    if (column > 0) {
      text << ':' << column;
    }
  }
  return text.str();
}

std::string InputProblem::to_string() const {
  std::string text = where.to_string() + ": ";
  if (!key_path.empty()) {
    text += key_path + ": ";
  }
  text += message;
  if (similar_not_listed > 0) {
    text += "\n" + where.to_string() + ": ... and " + grouped_count(similar_not_listed) +
            " more error" + (similar_not_listed == 1 ? "" : "s") + " like this";
  }
  return text;
}

namespace {

// `text` without its digits and without what stands between double quotes.
std::string skeleton(const std::string& text) {
  std::string out;
  bool quoted = false;
  for (std::size_t i = 0; i < text.size(); ++i) {
    const char c = text[i];
    if (c == '\\' && quoted) {
      ++i;
    } else if (c == '"') {
      quoted = !quoted;
      out += c;
    } else if (!quoted && std::isdigit(static_cast<unsigned char>(c)) == 0) {
      out += c;
    }
  }
  return out;
}

// Runs of text without a space longer than this are shortened: a key or a
// value a reader echoed whole must not bury the message.
constexpr std::size_t longest_run = 200;

std::string shorten_long_runs(const std::string& text) {
  std::string out;
  std::size_t start = 0;
  while (start <= text.size()) {
    const std::size_t end = std::min(text.find(' ', start), text.size());
    const std::string_view run = std::string_view(text).substr(start, end - start);
    out += character_count(run) > longest_run ? echoed(run) : std::string(run);
    if (end == text.size()) {
      break;
    }
    out += ' ';
    start = end + 1;
  }
  return out;
}

InputProblem made_safe(InputProblem problem) {
  problem.where.file = shorten_long_runs(escape_control_characters(problem.where.file));
  problem.key_path = shorten_long_runs(escape_control_characters(problem.key_path));
  problem.message = shorten_long_runs(escape_control_characters(problem.message));
  return problem;
}

// Keeps the first problems_listed_per_kind of each kind (counting the rest
// in the last one listed), then the first problems_listed_in_all; returns
// what is kept and how many problems are neither listed nor counted.
std::pair<std::vector<InputProblem>, std::size_t> summarise(std::vector<InputProblem> problems,
                                                            std::size_t not_listed) {
  std::vector<InputProblem> listed;
  std::map<std::string, std::pair<std::size_t, std::size_t>> kinds;  // kind -> (listed, last)
  for (InputProblem& problem : problems) {
    auto& [count, last] = kinds[problem_kind(problem)];
    if (count < problems_listed_per_kind) {
      ++count;
      last = listed.size();
      listed.push_back(made_safe(std::move(problem)));
    } else {
      listed[last].similar_not_listed += 1 + problem.similar_not_listed;
    }
  }
  while (listed.size() > problems_listed_in_all) {
    not_listed += 1 + listed.back().similar_not_listed;
    listed.pop_back();
  }
  return {std::move(listed), not_listed};
}

std::string join(const std::vector<InputProblem>& problems, std::size_t not_listed) {
  std::string text;
  for (const InputProblem& problem : problems) {
    if (!text.empty()) {
      text += '\n';
    }
    text += problem.to_string();
  }
  if (not_listed > 0) {
    const std::string file = problems.empty() ? "<input>" : problems.back().where.file;
    text += "\n" + file + ": ... and " + grouped_count(not_listed) + " more error" +
            (not_listed == 1 ? "" : "s");
  }
  return text;
}

}  // namespace

std::string problem_kind(const InputProblem& problem) {
  return skeleton(problem.key_path) + '\n' + skeleton(problem.message);
}

InputError::InputError(std::pair<std::vector<InputProblem>, std::size_t> summary,
                       Summarised /*tag*/)
    : std::runtime_error(join(summary.first, summary.second)),
      problems_(std::move(summary.first)),
      not_listed_(summary.second) {}

InputError::InputError(std::vector<InputProblem> problems, std::size_t not_listed)
    : InputError(summarise(std::move(problems), not_listed), Summarised{}) {}

InputError::InputError(SourceLocation where, std::string key_path, std::string message)
    : InputError(std::vector<InputProblem>{
          InputProblem{std::move(where), std::move(key_path), std::move(message)}}) {}

}  // namespace plystrain
