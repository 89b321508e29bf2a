#include "plystrain/solver/atomic_file.hpp"

#include <cerrno>
#include <cstring>
#include <fstream>
#include <stdexcept>
#include <string>
#include <system_error>
#include <unistd.h>

namespace plystrain {

namespace {

std::filesystem::path temporary_beside(const std::filesystem::path& target) {
  // The process id keeps two runs writing the same directory from clashing;
  // the extension is kept because some writers (Gmsh) choose the format by it.
  // Appended piece by piece: GCC 12 gives a false -Wrestrict on "." + string.
  std::string name(1, '.');
  name.append(target.stem().string());
  name.append(".partial-");
  name.append(std::to_string(::getpid()));
  name.append(target.extension().string());
  return target.parent_path() / name;
}

void rename_into_place(const std::filesystem::path& temporary,
                       const std::filesystem::path& target) {
  std::error_code error;
  std::filesystem::rename(temporary, target, error);
  if (error) {
    std::filesystem::remove(temporary, error);
    throw std::runtime_error("cannot move the finished file into place as " + target.string());
  }
}

}  // namespace

void write_file_atomically(const std::filesystem::path& target, std::string_view contents) {
  const std::filesystem::path temporary = temporary_beside(target);
  {
    std::ofstream out(temporary, std::ios::binary | std::ios::trunc);
    if (!out) {
      throw std::runtime_error("cannot open " + temporary.string() + " for writing");
    }
    errno = 0;
    out.write(contents.data(), static_cast<std::streamsize>(contents.size()));
    out.flush();
    if (out) {
      out.close();
    }
    if (!out) {
      // The stream keeps no reason; the failed write(2) left it in errno.
      const int reason = errno;
      out.close();
      std::error_code ignored;
      std::filesystem::remove(temporary, ignored);
      throw OutputWriteError(target, reason != 0 ? std::strerror(reason) : "the write failed");
    }
  }
  rename_into_place(temporary, target);
}

void write_path_atomically(const std::filesystem::path& target,
                           const std::function<bool(const std::filesystem::path&)>& write) {
  const std::filesystem::path temporary = temporary_beside(target);
  bool written = false;
  try {
    written = write(temporary);
  } catch (...) {
    std::error_code ignored;
    std::filesystem::remove(temporary, ignored);
    throw;
  }
  if (!written || !std::filesystem::exists(temporary)) {
    std::error_code ignored;
    std::filesystem::remove(temporary, ignored);
    throw std::runtime_error("cannot write " + target.string());
  }
  rename_into_place(temporary, target);
}

}  // namespace plystrain
