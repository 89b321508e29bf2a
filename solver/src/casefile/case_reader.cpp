#include "plystrain/solver/case_reader.hpp"

#include "case_document.hpp"
#include "plystrain/solver/case_variants.hpp"

#include <fstream>
#include <iterator>
#include <system_error>

namespace plystrain {

namespace {

std::string read_bytes(const std::filesystem::path& file) {
  const SourceLocation whole{file.string(), 0, 0};
  std::error_code error;
  if (std::filesystem::is_directory(file, error)) {
    throw InputError(whole, "", "expected a case file, found a directory");
  }
  std::ifstream stream(file, std::ios::binary);
  if (!stream) {
    throw InputError(whole, "", "cannot open the case file (does it exist and is it readable?)");
  }
  std::string bytes((std::istreambuf_iterator<char>(stream)), std::istreambuf_iterator<char>());
  if (stream.bad()) {
    throw InputError(whole, "", "cannot read the case file");
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
