// Output folders: each holds exactly one run.
//
// A run (or a comparison, or a sweep) is written into a fresh hidden folder
// beside its output folder, `.NAME.partial-PID`. When it ends (completed,
// stopped early or interrupted) that folder takes the output folder's place
// in one rename, and the previous run is removed. Until then the output
// folder keeps the previous run whole; bad input found on the way leaves it
// untouched, and a run killed outright leaves its files in the hidden folder.
//
// Only a folder plystrain wrote (it holds the marker file, or the files of a
// run, comparison or sweep of a version before the marker) or an empty one
// is ever replaced; anything else is refused as bad input. Folders that
// cannot be used (a file in the way, no permission to write) are bad input
// too, named plainly.
#pragma once

#include "plystrain/solver/input_error.hpp"

#include <filesystem>
#include <string>

namespace plystrain {

// Where an output folder was named, for the messages: the case's report.out
// (its line) or the command line's --out.
struct FolderSource {
  SourceLocation where;
  std::string key;  // "report.out" or "--out"
};

// The marker file that identifies a plystrain output folder.
inline constexpr const char* output_marker_name = ".plystrain-output";

class StagedOutput {
 public:
  // Checks that `folder` may be replaced and creates the hidden folder to
  // write into. Throws InputError (naming `source`) when it cannot be used.
  StagedOutput(const std::filesystem::path& folder, const FolderSource& source);
  // Removes the hidden folder unless it was committed.
  ~StagedOutput();
  StagedOutput(const StagedOutput&) = delete;
  StagedOutput& operator=(const StagedOutput&) = delete;

  // Where the run writes.
  [[nodiscard]] const std::filesystem::path& path() const { return staging_; }
  // The output folder it replaces.
  [[nodiscard]] const std::filesystem::path& folder() const { return folder_; }

  // Puts what was written in place of the output folder and removes the
  // previous run. Throws std::runtime_error when the file system refuses;
  // the message says where the files are.
  void commit();

 private:
  std::filesystem::path folder_;
  std::filesystem::path staging_;
  bool committed_ = false;
};

// For commands that add files to a folder without replacing it (`mesh`):
// checks the folder as above, except that one holding other files is kept
// and added to, and creates it (with the marker) when it does not exist.
void prepare_output_folder(const std::filesystem::path& folder, const FolderSource& source);

}  // namespace plystrain
