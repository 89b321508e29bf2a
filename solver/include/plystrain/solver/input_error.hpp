// User-input errors: a bad case file, material file or command-line value.
// Every one names where it came from so that the user can fix it at once:
//   file:line:column: key path: what was expected, what was found
#pragma once

#include <cstddef>
#include <stdexcept>
#include <string>
#include <utility>
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
  // Further problems of the same kind (problem_kind) found after this one and
  // not listed: one mistake repeated a million times is one line and a count.
  std::size_t similar_not_listed = 0;

  [[nodiscard]] std::string to_string() const;  // "where: key path: message" (+ the count)
};

// Problems of one kind: the same key path and message but for the numbers and
// the quoted values in them ("sweep.values[7]: expected a finite number,
// found the string \"x\"" is of the kind of values[8]'s).
[[nodiscard]] std::string problem_kind(const InputProblem& problem);

// How many problems of one kind are listed before the rest are counted, and
// how many problems are listed in all.
inline constexpr std::size_t problems_listed_per_kind = 5;
inline constexpr std::size_t problems_listed_in_all = 20;

// Thrown by readers for bad input. Carries the problems found (readers may
// report several at once); what() is all of them, one per line. The command
// line turns it into exit code 2.
//
// Whatever a reader wrote, the problems kept here hold no control characters
// (they are escaped, see input_text.hpp) and no run of text longer than a few
// hundred characters; problems beyond problems_listed_per_kind of one kind,
// and beyond problems_listed_in_all in all, are counted instead of listed.
class InputError : public std::runtime_error {
 public:
  // `not_listed`: problems the reader found but did not keep, counted only.
  explicit InputError(std::vector<InputProblem> problems, std::size_t not_listed = 0);
  InputError(SourceLocation where, std::string key_path, std::string message);

  [[nodiscard]] const std::vector<InputProblem>& problems() const { return problems_; }
  // Problems found but neither listed nor counted in a listed problem.
  [[nodiscard]] std::size_t not_listed() const { return not_listed_; }

 private:
  struct Summarised {};
  InputError(std::pair<std::vector<InputProblem>, std::size_t> summary, Summarised /*tag*/);

  std::vector<InputProblem> problems_;
  std::size_t not_listed_ = 0;
};

}  // namespace plystrain
