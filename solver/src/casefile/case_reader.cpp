#include "plystrain/solver/case_reader.hpp"

#include "case_document.hpp"
#include "plystrain/solver/case_variants.hpp"

#include "plystrain/solver/case_limits.hpp"

#include <cerrno>
#include <system_error>

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

namespace plystrain {

namespace {

// What a case path names when it is not a plain file.
const char* kind_of_file(mode_t mode) {
  if (S_ISDIR(mode)) {
    return "a directory";
  }
  if (S_ISFIFO(mode)) {
    return "a named pipe (FIFO)";
  }
  if (S_ISCHR(mode)) {
    return "a character device";
  }
  if (S_ISBLK(mode)) {
    return "a block device";
  }
  if (S_ISSOCK(mode)) {
    return "a socket";
  }
  return "something that is not a regular file";
}

// Closes a POSIX file descriptor when it goes out of scope.
class Descriptor {
 public:
  explicit Descriptor(int fd) : fd_(fd) {}
  Descriptor(const Descriptor&) = delete;
  Descriptor& operator=(const Descriptor&) = delete;
  ~Descriptor() {
    if (fd_ >= 0) {
      ::close(fd_);
    }
  }
  [[nodiscard]] int get() const { return fd_; }

 private:
  int fd_;
};

// The first case_file_bytes + 1 bytes of the case file: enough for the text
// check to say where the limit is passed, never the whole of a huge file.
// Opened without blocking and refused unless it is a regular file: a named
// pipe with no writer would otherwise wait forever, and a device never ends.
std::string read_bytes(const std::filesystem::path& file) {
  const SourceLocation whole{file.string(), 0, 0};
  const Descriptor fd(::open(file.c_str(), O_RDONLY | O_NONBLOCK | O_CLOEXEC));
  if (fd.get() < 0) {
    throw InputError(whole, "", "cannot open the case file (does it exist and is it readable?)");
  }
  struct stat status {};
  if (::fstat(fd.get(), &status) != 0) {
    throw InputError(whole, "", "cannot read the case file");
  }
  if (!S_ISREG(status.st_mode)) {
    throw InputError(whole, "",
                     std::string("expected a case file (a regular file), found ") +
                         kind_of_file(status.st_mode));
  }
  std::string bytes;
  char buffer[65536];
  while (bytes.size() <= limits::case_file_bytes) {
    const ssize_t count = ::read(fd.get(), buffer, sizeof buffer);
    if (count < 0 && errno == EINTR) {
      continue;
    }
    if (count < 0) {
      throw InputError(whole, "", "cannot read the case file");
    }
    if (count == 0) {
      break;
    }
    bytes.append(buffer, static_cast<std::size_t>(count));
  }
  return bytes;
}

// Resolving every variant and sweep value once makes a case that reads a
// case whose variants all run.
CaseSpec checked(CaseSpec spec) {
  static_cast<void>(resolve_variants(spec));
  static_cast<void>(resolve_sweep(spec));
  return spec;
}

std::vector<std::filesystem::path> material_paths(const casefile::CaseDocument& document) {
  std::vector<std::filesystem::path> paths;
  const casefile::Entry* files = document.top.find("materials");
  if (files == nullptr) {
    return paths;
  }
  casefile::Problems problems;
  for (const std::string& file : std::get<std::vector<std::string>>(files->value)) {
    const std::filesystem::path path = document.source.parent_path() / file;
    std::error_code error;
    if (!std::filesystem::is_regular_file(path, error)) {
      problems.add(files->where, "materials",
                   "expected a material file, found no file at \"" + path.string() + "\"");
    }
    paths.push_back(path);
  }
  problems.throw_if_any();
  return paths;
}

}  // namespace

CaseSpec read_case_text(std::string_view text, const std::filesystem::path& file,
                        const MaterialLibrary& library) {
  return checked(casefile::build_case(casefile::parse_case_document(text, file), library));
}

CaseSpec read_case(const std::filesystem::path& file, const MaterialLibrary& library) {
  return read_case_text(read_bytes(file), file, library);
}

CaseSpec read_case(const std::filesystem::path& file) {
  const std::string text = read_bytes(file);
  const casefile::CaseDocument document = casefile::parse_case_document(text, file);
  const MaterialLibrary library = load_material_library(material_paths(document));
  return checked(casefile::build_case(document, library));
}

std::vector<std::filesystem::path> case_material_paths(const CaseSpec& spec) {
  std::vector<std::filesystem::path> paths;
  for (const Located<std::string>& file : spec.material_files) {
    paths.push_back(spec.source.parent_path() / file.value);
  }
  return paths;
}

}  // namespace plystrain
