#include "plystrain/solver/input_error.hpp"

#include <sstream>

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
  return text + message;
}

namespace {
std::string join(const std::vector<InputProblem>& problems) {
  std::string text;
  for (const InputProblem& problem : problems) {
    if (!text.empty()) {
      text += '\n';
    }
    text += problem.to_string();
  }
  return text;
}
}  // namespace

InputError::InputError(std::vector<InputProblem> problems)
    : std::runtime_error(join(problems)), problems_(std::move(problems)) {}

InputError::InputError(SourceLocation where, std::string key_path, std::string message)
    : InputError(std::vector<InputProblem>{
          InputProblem{std::move(where), std::move(key_path), std::move(message)}}) {}

}  // namespace plystrain
