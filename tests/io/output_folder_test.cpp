// Output folders hold one run: a run is written beside the folder and takes
// its place when it ends; a folder plystrain did not write is never replaced.
#include "io_fixtures.hpp"

#include "plystrain/solver/atomic_file.hpp"
#include "plystrain/solver/input_error.hpp"
#include "plystrain/solver/output_folder.hpp"

#include <catch2/catch.hpp>

#include <filesystem>
#include <fstream>
#include <set>
#include <string>

namespace {

namespace fs = std::filesystem;

const plystrain::FolderSource from_case{{"case.toml", 12, 7}, "report.out"};

std::set<std::string> names_in(const fs::path& folder) {
  std::set<std::string> names;
  for (const fs::directory_entry& entry : fs::directory_iterator(folder)) {
    names.insert(entry.path().filename().string());
  }
  return names;
}

void write(const fs::path& file, const std::string& text) {
  fs::create_directories(file.parent_path());
  std::ofstream(file) << text;
}

// The InputError's text, or empty when the call does not throw one.
template <class Call>
std::string input_error_of(Call&& call) {
  try {
    call();
  } catch (const plystrain::InputError& error) {
    return error.what();
  }
  return {};
}

}  // namespace

TEST_CASE("a run goes into a hidden folder beside its output folder and takes its place",
          "[output_folder]") {
  const plystrain::test::ScratchDirectory scratch("staged-new");
  const fs::path folder = scratch.path() / "run";
  {
    plystrain::StagedOutput staged(folder, from_case);
    CHECK(staged.path().parent_path() == scratch.path());
    CHECK(staged.path().filename().string().rfind(".run.partial-", 0) == 0);
    CHECK_FALSE(fs::exists(folder));
    write(staged.path() / "results.json", "{}");
    staged.commit();
  }
  CHECK(names_in(folder) == std::set<std::string>{plystrain::output_marker_name, "results.json"});
  CHECK(names_in(scratch.path()) == std::set<std::string>{"run"});
}

TEST_CASE("the new run replaces every file of the previous one", "[output_folder]") {
  const plystrain::test::ScratchDirectory scratch("staged-replace");
  const fs::path folder = scratch.path() / "run";
  {
    plystrain::StagedOutput first(folder, from_case);
    write(first.path() / "fields" / "step-0002.vtu", "old");
    write(first.path() / "results.json", "old");
    first.commit();
  }
  {
    plystrain::StagedOutput second(folder, from_case);
    // Until the new run ends the folder keeps the old one whole.
    CHECK(fs::exists(folder / "fields" / "step-0002.vtu"));
    write(second.path() / "results.json", "new");
    second.commit();
  }
  CHECK(names_in(folder) == std::set<std::string>{plystrain::output_marker_name, "results.json"});
  std::ifstream results(folder / "results.json");
  std::string text;
  results >> text;
  CHECK(text == "new");
  CHECK(names_in(scratch.path()) == std::set<std::string>{"run"});
}

TEST_CASE("a run that is not committed leaves the previous one as it was", "[output_folder]") {
  const plystrain::test::ScratchDirectory scratch("staged-discard");
  const fs::path folder = scratch.path() / "run";
  write(folder / plystrain::output_marker_name, "");
  write(folder / "results.json", "old");
  {
    plystrain::StagedOutput staged(folder, from_case);
    write(staged.path() / "results.json", "new");
  }
  CHECK(names_in(folder) == std::set<std::string>{plystrain::output_marker_name, "results.json"});
  CHECK(names_in(scratch.path()) == std::set<std::string>{"run"});
}

TEST_CASE("a folder plystrain did not write is refused and kept", "[output_folder]") {
  const plystrain::test::ScratchDirectory scratch("staged-foreign");
  const fs::path folder = scratch.path() / "thesis";
  write(folder / "notes.txt", "mine");
  const std::string message =
      input_error_of([&] { plystrain::StagedOutput staged(folder, from_case); });
  CHECK(message.rfind("case.toml:12:7: report.out: ", 0) == 0);
  CHECK(message.find("holds files plystrain did not write") != std::string::npos);
  CHECK(names_in(folder) == std::set<std::string>{"notes.txt"});
  CHECK(names_in(scratch.path()) == std::set<std::string>{"thesis"});
}

TEST_CASE("folders of runs written before the marker, and empty ones, are replaced",
          "[output_folder]") {
  const plystrain::test::ScratchDirectory scratch("staged-legacy");
  // A run's log opens with the program's name and version; a comparison
  // or sweep folder has its table; a mesh-only folder holds the two meshes.
  write(scratch.path() / "run" / "log.txt", "plystrain 0.1.0, case a.toml (hash 0)\n");
  write(scratch.path() / "run" / "results.json", "{}");
  write(scratch.path() / "compare" / "comparison.json", "{}");
  write(scratch.path() / "swept" / "sweep.json", "{}");
  write(scratch.path() / "meshed" / "mesh.msh", "");
  write(scratch.path() / "meshed" / "mesh.vtu", "");
  fs::create_directories(scratch.path() / "empty");
  for (const char* name : {"run", "compare", "swept", "meshed", "empty"}) {
    INFO(name);
    plystrain::StagedOutput staged(scratch.path() / name, from_case);
    staged.commit();
    CHECK(names_in(scratch.path() / name) == std::set<std::string>{plystrain::output_marker_name});
  }
}

TEST_CASE("an output folder in the way of a file is bad input", "[output_folder]") {
  const plystrain::test::ScratchDirectory scratch("staged-file");
  write(scratch.path() / "taken", "a file");
  plystrain::FolderSource from_command_line;
  from_command_line.where.file = "command line";
  from_command_line.key = "--out";
  const std::string message = input_error_of(
      [&] { plystrain::StagedOutput staged(scratch.path() / "taken", from_command_line); });
  CHECK(message.rfind("command line: --out: ", 0) == 0);
  CHECK(message.find("is a file, not a folder") != std::string::npos);
  const std::string below = input_error_of([&] {
    plystrain::StagedOutput staged(scratch.path() / "taken" / "below", from_command_line);
  });
  CHECK(below.find("cannot create the output folder") != std::string::npos);
  CHECK(input_error_of([&] {
          plystrain::prepare_output_folder(scratch.path() / "taken", from_case);
        }).find("is a file, not a folder") != std::string::npos);
}

TEST_CASE("a folder for added files is made with the marker, and a foreign one is kept",
          "[output_folder]") {
  const plystrain::test::ScratchDirectory scratch("prepare");
  plystrain::prepare_output_folder(scratch.path() / "new", from_case);
  CHECK(names_in(scratch.path() / "new") == std::set<std::string>{plystrain::output_marker_name});
  write(scratch.path() / "mine" / "notes.txt", "mine");
  plystrain::prepare_output_folder(scratch.path() / "mine", from_case);
  CHECK(names_in(scratch.path() / "mine") == std::set<std::string>{"notes.txt"});
}
