// A mutation fuzzer over the example and test cases, run through the reader
// and `check`'s summary in-process. Every mutant must be read or refused with
// an InputError whose problems name the file and a line; no message may carry
// a raw control character. A sample of the mutants the reader accepts must
// then be accepted by the mesher and the solver's set-up as well: `check`
// must not pass what `run` refuses.
//
// PLYSTRAIN_FUZZ_MUTANTS, PLYSTRAIN_FUZZ_MESHES and PLYSTRAIN_FUZZ_SEED
// change the count of mutants (2,000), of meshed mutants (12) and the seed
// (1) for a longer run by hand; a failure names the mutant's number, which
// makes it again under the same seed.
#include "case_mutator.hpp"

#include "plystrain/mesh/mesh_error.hpp"
#include "plystrain/mesh/stack_mesher.hpp"
#include "plystrain/solver/case_reader.hpp"
#include "plystrain/solver/case_summary.hpp"
#include "plystrain/solver/input_text.hpp"
#include "plystrain/solver/model.hpp"
#include "plystrain/solver/stack_analysis.hpp"
#include "plystrain/solver/stack_from_case.hpp"

#include <catch2/catch.hpp>

#include <algorithm>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <optional>

using namespace plystrain;

namespace {

std::filesystem::path source_dir() {
  return std::filesystem::path(PLYSTRAIN_SOURCE_DIR);
}
std::filesystem::path data_dir() {
  return std::filesystem::path(PLYSTRAIN_TEST_DATA_DIR);
}

std::string read_text(const std::filesystem::path& file) {
  std::ifstream stream(file, std::ios::binary);
  return {std::istreambuf_iterator<char>(stream), std::istreambuf_iterator<char>()};
}

std::size_t setting(const char* name, std::size_t fallback) {
  const char* text = std::getenv(name);
  return text == nullptr ? fallback : static_cast<std::size_t>(std::strtoull(text, nullptr, 10));
}

bool is_case_file(const std::filesystem::path& file) {
  // Material files live beside some cases; they are not cases.
  const std::string text = read_text(file);
  return file.extension() == ".toml" && text.find("format = 1") != std::string::npos;
}

// Every example case and every test case, good and bad, in a fixed order.
// The good ones count three times: a mutant of a bad case is nearly always
// refused, and the accepted path needs its share of mutants too.
std::vector<std::string> seed_cases() {
  std::vector<std::filesystem::path> files;
  for (const auto& entry : std::filesystem::directory_iterator(source_dir() / "cases")) {
    if (std::filesystem::exists(entry.path() / "case.toml")) {
      files.push_back(entry.path() / "case.toml");
    }
  }
  for (const char* folder : {"cases/good", "cases/bad", "cli"}) {
    for (const auto& entry : std::filesystem::directory_iterator(data_dir() / folder)) {
      // The kept crash reproducers are large; their mutants are all refused by size or depth.
      if (is_case_file(entry.path()) && std::filesystem::file_size(entry.path()) < 20000) {
        files.push_back(entry.path());
      }
    }
  }
  std::sort(files.begin(), files.end());
  std::vector<std::string> seeds;
  for (const std::filesystem::path& file : files) {
    const bool bad = file.parent_path().filename() == "bad";
    for (int copy = 0; copy < (bad ? 1 : 3); ++copy) {
      seeds.push_back(read_text(file));
    }
  }
  return seeds;
}

// The built-in library and the material files the test cases name.
const MaterialLibrary& library() {
  static const MaterialLibrary merged =
      load_material_library({data_dir() / "cases" / "good" / "extra-materials.toml",
                             data_dir() / "cli" / "check-materials.toml"});
  return merged;
}

const char* const mutant_file = "mutant.toml";

// What is wrong with `text` as something shown to a user: a control
// character other than the line breaks between problems.
std::optional<std::string> unsafe_text(const std::string& text) {
  std::size_t start = 0;
  while (start <= text.size()) {
    const std::size_t end = std::min(text.find('\n', start), text.size());
    if (has_control_characters(std::string_view(text).substr(start, end - start))) {
      return "a control character in: " +
             escape_control_characters(text.substr(start, end - start));
    }
    start = end + 1;
  }
  return std::nullopt;
}

// What is wrong with a refusal of `file`, if anything.
std::optional<std::string> bad_refusal(const InputError& error, const std::string& file) {
  if (error.problems().empty()) {
    return "an InputError without problems";
  }
  for (const InputProblem& problem : error.problems()) {
    if (problem.where.file != file || problem.where.line < 1) {
      return "a problem without file:line: " + problem.to_string();
    }
  }
  return unsafe_text(error.what());
}

struct Outcome {
  std::optional<CaseSpec> accepted;
  std::optional<std::string> failure;
};

// Reads the mutant as `check` does: the case, every variant and sweep value
// (read_case resolves them), and the summary `check` prints.
Outcome try_mutant(const std::string& text) {
  Outcome outcome;
  try {
    CaseSpec spec = read_case_text(text, mutant_file, library());
    outcome.failure = unsafe_text(format_case_summary(spec));
    outcome.accepted = std::move(spec);
  } catch (const InputError& error) {
    outcome.failure = bad_refusal(error, mutant_file);
  } catch (const std::exception& error) {
    outcome.failure = std::string("an exception that is not an InputError: ") + error.what();
  }
  return outcome;
}

std::string describe(std::size_t number, const fuzz::Mutant& mutant) {
  std::string text = "mutant " + std::to_string(number) + ":";
  for (const std::string& edit : mutant.edits) {
    text += " " + edit + ";";
  }
  return text;
}

// Meshes the case and sets up each of its solves, as `run` does before it
// solves; the text of whatever refuses it, or nothing.
std::optional<std::string> set_up_problem(const CaseSpec& spec) {
  try {
    mesh::Mesh grid = mesh::build_stack_mesh(stack_from_case(spec));
    if (static_cast<double>(grid.cell_count()) > estimated_mesh_cells(spec)) {
      return "the mesh has " + std::to_string(grid.cell_count()) +
             " cells, more than the reader's estimate, which the limit on cells relies on";
    }
    std::vector<LoadCase> load_cases = build_load_cases(spec, grid);
    for (LoadCase& load_case : load_cases) {
      const solver::Model model(grid, load_case.definition);
      if (model.size() <= 0) {
        return std::string("a model without unknowns");
      }
    }
  } catch (const mesh::MeshError& error) {
    return std::string("the mesher refused it: ") + error.what();
  } catch (const std::exception& error) {
    return std::string("the set-up refused it: ") + error.what();
  }
  return std::nullopt;
}

}  // namespace

TEST_CASE("mutants of the cases are read or refused with file and line", "[fuzz]") {
  const fuzz::CaseMutator mutator(seed_cases(), setting("PLYSTRAIN_FUZZ_SEED", 1));
  REQUIRE(mutator.seed_count() >= 40);
  const std::size_t count = setting("PLYSTRAIN_FUZZ_MUTANTS", 2000);
  std::size_t accepted = 0;
  for (std::size_t number = 0; number < count; ++number) {
    const fuzz::Mutant mutant = mutator.make(number);
    const Outcome outcome = try_mutant(mutant.text);
    if (outcome.failure) {
      FAIL(describe(number, mutant) << "\n" << *outcome.failure);
    }
    accepted += outcome.accepted ? 1 : 0;
  }
  // Some edits keep a valid case (a comment deleted, a value still in
  // range) and most do not: both paths are exercised.
  CHECK(accepted > count / 100);
  CHECK(accepted < count / 2);
}

TEST_CASE("accepted mutants are accepted by the mesher and the solver set-up", "[fuzz]") {
  const fuzz::CaseMutator mutator(seed_cases(), setting("PLYSTRAIN_FUZZ_SEED", 1) + 7);
  // A bounded sample: meshing is the slow part, so only small meshes.
  const std::size_t wanted = setting("PLYSTRAIN_FUZZ_MESHES", 12);
  constexpr double small_mesh = 20000;
  std::size_t checked = 0;
  for (std::size_t number = 0; number < 250 * wanted && checked < wanted; ++number) {
    const fuzz::Mutant mutant = mutator.make(number);
    const Outcome outcome = try_mutant(mutant.text);
    if (!outcome.accepted || estimated_mesh_cells(*outcome.accepted) > small_mesh) {
      continue;
    }
    ++checked;
    if (const std::optional<std::string> problem = set_up_problem(*outcome.accepted)) {
      FAIL(describe(number, mutant) << "\n" << *problem);
    }
  }
  CHECK(checked == wanted);
}

TEST_CASE("inputs the fuzzer found crashing the reader are refused cleanly", "[fuzz]") {
  std::vector<std::filesystem::path> files;
  for (const auto& entry :
       std::filesystem::directory_iterator(data_dir() / "cases" / "fuzz-found")) {
    files.push_back(entry.path());
  }
  REQUIRE(files.size() >= 2);
  for (const std::filesystem::path& file : files) {
    INFO(file.string());
    try {
      static_cast<void>(read_case(file, library()));
      FAIL("read a case that must be refused");
    } catch (const InputError& error) {
      const std::optional<std::string> problem = bad_refusal(error, file.string());
      CHECK_FALSE(problem.has_value());
    }
  }
}
