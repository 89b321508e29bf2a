// User-input errors: a bad case file, material file or command-line value.
// Every one names where it came from so that the user can fix it at once:
//   file:line:column: key path: what was expected, what was found
#pragma once

#include <stdexcept>
#include <string>
#include <vector>

namespace plystrain {

// Where a value came from in a user's file. line/column are 1-based; 0 means
// unknown (the whole file, or a value made by a variant).
struct SourceLocation {
  std::string file;
  int line = 0;
  int column = 0;

  [[nodiscard]] std::string to_string() const;  // "file:line:column" (parts omitted when 0)
};

struct InputProblem {
  SourceLocation where;
  std::string key_path;  // e.g. "layer.absorber.thickness" or "defect[2].size"
  std::string message;   // what was expected, what was found

  [[nodiscard]] std::string to_string() const;  // "where: key path: message"
};

// Thrown by readers for bad input. Carries every problem found (readers may
// report several at once); what() is all of them, one per line. The command
// line turns it into exit code 2.
class InputError : public std::runtime_error {
 public:
  explicit InputError(std::vector<InputProblem> problems);
  InputError(SourceLocation where, std::string key_path, std::string message);

  [[nodiscard]] const std::vector<InputProblem>& problems() const { return problems_; }

 private:
  std::vector<InputProblem> problems_;
};

}  // namespace plystrain
