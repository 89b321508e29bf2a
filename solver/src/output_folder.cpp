#include "plystrain/solver/output_folder.hpp"

#include "plystrain/solver/atomic_file.hpp"

#include <fcntl.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>  // renameat2
#include <cstring>
#include <fstream>
#include <stdexcept>
#include <system_error>

namespace plystrain {

namespace {

namespace fs = std::filesystem;

constexpr const char* marker_text =
    "plystrain output folder: the next run into this folder replaces everything in it.\n";

[[noreturn]] void refuse(const FolderSource& source, const std::string& message) {
  throw InputError(source.where, source.key, message);
}

std::string reason(const std::error_code& error) {
  return error.message();
}

// Absolute, without a trailing separator, links resolved as far as they
// exist: the hidden folder must lie beside the real one.
fs::path resolved(const fs::path& folder, const FolderSource& source) {
  std::error_code error;
  fs::path path = fs::weakly_canonical(fs::absolute(folder, error), error);
  if (error) {
    refuse(source, "cannot use \"" + folder.string() + "\" as the output folder: " + reason(error));
  }
  if (!path.has_filename()) {
    path = path.parent_path();
  }
  if (path == path.root_path() || !path.has_filename()) {
    refuse(source, "expected an output folder, found the root folder \"" + path.string() + "\"");
  }
  return path;
}

bool first_line_starts_with(const fs::path& file, const std::string& start) {
  std::ifstream in(file);
  std::string line;
  return std::getline(in, line) && line.rfind(start, 0) == 0;
}

// The folder holds what plystrain writes: its marker, or (written before the
// marker existed) a run's log, a comparison or sweep table, or a mesh alone.
bool written_by_plystrain(const fs::path& folder) {
  const auto present = [&](const char* name) {
    std::error_code ignored;
    return fs::exists(folder / name, ignored);
  };
  if (present(output_marker_name) || present("comparison.json") || present("sweep.json") ||
      first_line_starts_with(folder / "log.txt", "plystrain ")) {
    return true;
  }
  bool mesh_only = true;
  std::error_code error;
  for (const fs::directory_entry& entry : fs::directory_iterator(folder, error)) {
    const std::string name = entry.path().filename().string();
    mesh_only = mesh_only && (name == "mesh.msh" || name == "mesh.vtu");
  }
  return mesh_only && !error;
}

bool holds_files(const fs::path& folder) {
  std::error_code error;
  return fs::is_directory(folder, error) && !fs::is_empty(folder, error);
}

// The checks every output folder passes: not a file, writable, and a parent
// folder that exists or can be made.
void check_usable(const fs::path& folder, const FolderSource& source) {
  std::error_code error;
  const fs::file_status status = fs::status(folder, error);
  if (fs::exists(status)) {
    if (!fs::is_directory(status)) {
      refuse(source, "the output folder \"" + folder.string() +
                         "\" is a file, not a folder: name another output folder");
    }
    if (::access(folder.c_str(), W_OK) != 0) {
      const std::string why = std::strerror(errno);
      refuse(source, "the output folder \"" + folder.string() + "\" is read-only (" + why +
                         "): name a folder you may write in");
    }
    return;
  }
  fs::create_directories(folder.parent_path(), error);
  if (error) {
    refuse(source, "cannot create the output folder \"" + folder.string() + "\": " + reason(error) +
                       " (at \"" + folder.parent_path().string() + "\")");
  }
}

void write_marker(const fs::path& folder) {
  write_file_atomically(folder / output_marker_name, marker_text);
}

fs::path sibling(const fs::path& folder, const std::string& kind) {
  return folder.parent_path() /
         ("." + folder.filename().string() + "." + kind + "-" + std::to_string(::getpid()));
}

void remove_quietly(const fs::path& path) {
  std::error_code ignored;
  fs::remove_all(path, ignored);
}

// Swaps the two folders in one step where the file system can (Linux
// renameat2); elsewhere moves the old one aside first.
void replace_folder(const fs::path& fresh, const fs::path& folder) {
  std::error_code missing;
  if (!fs::exists(folder, missing)) {
    fs::rename(fresh, folder);
    return;
  }
  if (::renameat2(AT_FDCWD, fresh.c_str(), AT_FDCWD, folder.c_str(), RENAME_EXCHANGE) == 0) {
    remove_quietly(fresh);  // now the previous run
    return;
  }
  const int exchange_error = errno;
  if (exchange_error != EINVAL && exchange_error != ENOSYS && exchange_error != ENOTSUP) {
    throw std::system_error(exchange_error, std::generic_category());
  }
  const fs::path aside = sibling(folder, "replaced");
  fs::rename(folder, aside);
  fs::rename(fresh, folder);
  remove_quietly(aside);
}

}  // namespace

StagedOutput::StagedOutput(const fs::path& folder, const FolderSource& source)
    : folder_(resolved(folder, source)), staging_(sibling(folder_, "partial")) {
  check_usable(folder_, source);
  if (holds_files(folder_) && !written_by_plystrain(folder_)) {
    refuse(source, "the output folder \"" + folder_.string() +
                       "\" holds files plystrain did not write, and a run replaces its output "
                       "folder whole: name a new or empty folder, or one an earlier run wrote");
  }
  remove_quietly(staging_);  // left by an earlier process of the same id
  std::error_code error;
  fs::create_directory(staging_, error);
  if (error) {
    refuse(source, "cannot write beside the output folder \"" + folder_.string() +
                       "\": " + reason(error) + "; a run is written into \"" +
                       staging_.filename().string() + "\" in \"" + folder_.parent_path().string() +
                       "\" and then takes the output folder's place, so that folder must be "
                       "writable");
  }
  write_marker(staging_);
}

StagedOutput::~StagedOutput() {
  if (!committed_) {
    remove_quietly(staging_);
  }
}

void StagedOutput::commit() {
  if (committed_) {
    return;
  }
  try {
    replace_folder(staging_, folder_);
  } catch (const std::exception& error) {
    committed_ = true;  // keep the files where they are
    throw std::runtime_error("cannot move the finished run into \"" + folder_.string() + "\" (" +
                             error.what() + "); its files are in \"" + staging_.string() + "\"");
  }
  committed_ = true;
}

void prepare_output_folder(const fs::path& folder, const FolderSource& source) {
  const fs::path path = resolved(folder, source);
  check_usable(path, source);
  if (holds_files(path)) {
    return;
  }
  std::error_code error;
  fs::create_directory(path, error);
  if (error) {
    refuse(source, "cannot create the output folder \"" + path.string() + "\": " + reason(error));
  }
  write_marker(path);
}

}  // namespace plystrain
