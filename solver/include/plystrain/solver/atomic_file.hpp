// Whole-or-nothing file output: a file that exists is complete.
#pragma once

#include <filesystem>
#include <functional>
#include <string_view>

namespace plystrain {

// Writes `contents` to a temporary file beside `target`, then renames it over
// `target`. Throws std::runtime_error (naming the file) when it cannot write;
// the target is then left as it was.
void write_file_atomically(const std::filesystem::path& target, std::string_view contents);

// For writers that need a path (e.g. VTK): `write` is called with a temporary
// path beside `target` and must create that file; on success it is renamed
// over `target`, on failure (exception or false) it is removed.
void write_path_atomically(const std::filesystem::path& target,
                           const std::function<bool(const std::filesystem::path&)>& write);

}  // namespace plystrain
