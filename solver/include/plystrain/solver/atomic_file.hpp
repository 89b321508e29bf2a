// Whole-or-nothing file output: a file that exists is complete.
#pragma once

#include <filesystem>
#include <functional>
#include <stdexcept>
#include <string>
#include <string_view>

namespace plystrain {

// A file of the results could not be written (disk full, a file-size limit,
// an I/O error): not the case's fault nor the program's.
class OutputWriteError : public std::runtime_error {
 public:
  OutputWriteError(const std::filesystem::path& file, const std::string& reason)
      : std::runtime_error("cannot write " + file.string() + ": " + reason) {}
};

// Writes `contents` to a temporary file beside `target`, then renames it over
// `target`. Throws OutputWriteError (naming the file and the system's reason)
// when it cannot write, std::runtime_error when it cannot open or rename;
// the target is then left as it was.
void write_file_atomically(const std::filesystem::path& target, std::string_view contents);

// For writers that need a path (e.g. VTK): `write` is called with a temporary
// path beside `target` and must create that file; on success it is renamed
// over `target`, on failure (exception or false) it is removed.
void write_path_atomically(const std::filesystem::path& target,
                           const std::function<bool(const std::filesystem::path&)>& write);

}  // namespace plystrain
