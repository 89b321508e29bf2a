// Output folders that cannot be used are bad input (exit 2), named plainly;
// a folder holds one run, so a run replaces what `mesh` or an earlier run
// wrote there, and refuses a folder of other files.
#include "cli/cli_support.hpp"

#include <catch2/catch.hpp>

#include <unistd.h>

#include <algorithm>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <string>

using plystrain::test::data_path;
using plystrain::test::fresh_output_dir;
using plystrain::test::read_text;
using plystrain::test::run_plystrain;

namespace {

namespace fs = std::filesystem;

// A small uniform strip whose [report] table comes last, so that a line
// appended to it is a key of [report]; returns the case file.
fs::path strip_case(const fs::path& folder, const std::string& name, const std::string& extra) {
  fs::create_directories(folder);
  const fs::path file = folder / name;
  std::ofstream(file) << read_text(data_path("cli/homogeneous-strip-free.toml")) << extra;
  return file;
}

int line_count(const std::string& text) {
  return static_cast<int>(std::count(text.begin(), text.end(), '\n'));
}

std::string in_quotes(const fs::path& path) {
  return "'" + path.string() + "'";
}

// Makes `folder` read-only for this process: by its permissions, or, for
// root, whom permissions do not stop, by the immutable attribute.
bool make_read_only(const fs::path& folder) {
  if (::geteuid() != 0) {
    fs::permissions(folder, fs::perms::owner_read | fs::perms::owner_exec);
  } else if (std::system(("chattr +i " + in_quotes(folder) + " 2>/dev/null").c_str()) != 0) {
    return false;
  }
  const fs::path probe = folder / "probe";
  const bool created = static_cast<bool>(std::ofstream(probe));
  std::error_code ignored;
  fs::remove(probe, ignored);
  return !created;
}

void make_writable(const fs::path& folder) {
  if (::geteuid() == 0) {
    static_cast<void>(std::system(("chattr -i " + in_quotes(folder) + " 2>/dev/null").c_str()));
  }
  fs::permissions(folder, fs::perms::owner_all);
}

}  // namespace

TEST_CASE("an output folder name that cannot be a folder is bad input at its line",
          "[cli][output]") {
  const fs::path scratch = fresh_output_dir("output-names");
  const std::string base = read_text(data_path("cli/homogeneous-strip-free.toml"));
  const int out_line = line_count(base) + 1;
  // An empty name would be the case's own folder; a NUL would cut it short.
  const fs::path empty = strip_case(scratch, "empty.toml", "out = \"\"\n");
  const fs::path nul = strip_case(scratch, "nul.toml", "out = \"a\\u0000b\"\n");
  // A NUL is caught earlier, by the rule that no string value holds control characters.
  for (const auto& [file, found] :
       {std::pair{empty, std::string("expected the name of an output folder, found \"\"")},
        std::pair{nul, std::string("expected a string without control characters, found "
                                   "\"a\\u0000b\"")}}) {
    const auto result = run_plystrain("run " + in_quotes(file));
    INFO(result.err);
    CHECK(result.exit_code == 2);
    CHECK(result.err.rfind(file.string() + ":" + std::to_string(out_line) + ":", 0) == 0);
    CHECK(result.err.find("report.out: " + found) != std::string::npos);
    CHECK(result.err.find("internal error") == std::string::npos);
  }
  CHECK_FALSE(fs::exists(scratch / "a"));
  const auto blank = run_plystrain("run " + in_quotes(empty) + " --out ''");
  CHECK(blank.exit_code == 2);
  fs::remove_all(scratch);
}

TEST_CASE("a file, a folder of other files or a read-only folder is refused as output",
          "[cli][output]") {
  const fs::path scratch = fresh_output_dir("output-refused");
  const fs::path file = strip_case(scratch, "strip.toml", "");
  const auto run_into = [&](const std::string& command, const fs::path& out) {
    return run_plystrain(command + " " + in_quotes(file) + " --out " + in_quotes(out));
  };

  std::ofstream(scratch / "taken") << "a file";
  for (const char* command : {"run", "mesh"}) {
    const auto result = run_into(command, scratch / "taken");
    INFO(command << ": " << result.err);
    CHECK(result.exit_code == 2);
    CHECK(result.err.find("is a file, not a folder") != std::string::npos);
  }
  const auto compare =
      run_plystrain("compare " + in_quotes(fs::path(data_path("cli/compare-small-strip.toml"))) +
                    " --out " + in_quotes(scratch / "taken"));
  CHECK(compare.exit_code == 2);
  CHECK(compare.err.find("is a file, not a folder") != std::string::npos);
  const auto below = run_into("run", scratch / "taken" / "below");
  CHECK(below.exit_code == 2);
  CHECK(below.err.find("cannot create the output folder") != std::string::npos);

  // A run replaces its folder whole: one holding the user's own files is
  // never its folder.
  fs::create_directories(scratch / "thesis");
  std::ofstream(scratch / "thesis" / "notes.txt") << "mine";
  const auto foreign = run_into("run", scratch / "thesis");
  CHECK(foreign.exit_code == 2);
  CHECK(foreign.err.find("holds files plystrain did not write") != std::string::npos);
  CHECK(read_text(scratch / "thesis" / "notes.txt") == "mine");

  const fs::path locked = scratch / "locked";
  fs::create_directories(locked);
  REQUIRE(make_read_only(locked));
  const auto read_only = run_into("run", locked);
  make_writable(locked);
  INFO(read_only.err);
  CHECK(read_only.exit_code == 2);
  CHECK(read_only.err.rfind("command line: --out: the output folder", 0) == 0);
  CHECK(read_only.err.find("is read-only") != std::string::npos);
  fs::remove_all(scratch);
}

TEST_CASE("a run replaces the meshes that mesh wrote into the same folder", "[cli][output]") {
  const fs::path scratch = fresh_output_dir("output-mesh-run");
  const fs::path file = strip_case(scratch, "strip.toml", "");
  const fs::path out = scratch / "out";
  REQUIRE(run_plystrain("mesh " + in_quotes(file) + " --out " + in_quotes(out)).exit_code == 0);
  REQUIRE(fs::exists(out / "mesh.msh"));
  const auto result = run_plystrain("run " + in_quotes(file) + " --out " + in_quotes(out));
  INFO(result.err);
  CHECK(result.exit_code == 0);
  CHECK(fs::exists(out / "results.json"));
  CHECK_FALSE(fs::exists(out / "mesh.msh"));
  fs::remove_all(scratch);
}

TEST_CASE("a write the disk refuses is named, and the output folder keeps its earlier run",
          "[cli][output]") {
  // A file-size limit (RLIMIT_FSIZE) stands in for a full disk: the write
  // fails with EFBIG where it would fail with ENOSPC. SIGXFSZ is ignored, as
  // a process that wants the error instead of the signal must (POSIX
  // setrlimit).
  const std::string small_files = "ulimit -f 4; trap '' XFSZ; ";
  const fs::path scratch = fresh_output_dir("output-write-refused");
  const fs::path file = strip_case(scratch, "strip.toml", "");
  const fs::path out = scratch / "out";
  REQUIRE(run_plystrain("run " + in_quotes(file) + " --out " + in_quotes(out)).exit_code == 0);
  const std::string earlier = read_text(out / "results.json");

  const auto run = run_plystrain("run " + in_quotes(file) + " --out " + in_quotes(out), small_files);
  INFO(run.err);
  CHECK(run.exit_code == 1);
  CHECK(run.err.find("plystrain: cannot write ") == 0);
  CHECK(run.err.find("File too large") != std::string::npos);
  CHECK(run.err.find("internal error") == std::string::npos);
  CHECK(read_text(out / "results.json") == earlier);
  for (const auto& entry : fs::directory_iterator(scratch)) {
    CHECK(entry.path().filename().string().find(".partial") == std::string::npos);
  }

  // Gmsh reports nothing when its write fails; the mesh command checks the
  // file it left and keeps no truncated mesh.
  const fs::path meshes = scratch / "meshes";
  const auto mesh = run_plystrain("mesh " + in_quotes(file) + " --out " + in_quotes(meshes), small_files);
  INFO(mesh.err);
  CHECK(mesh.exit_code == 1);
  CHECK(mesh.err.find("cannot write " + (meshes / "mesh.msh").string()) != std::string::npos);
  CHECK_FALSE(fs::exists(meshes / "mesh.msh"));
  fs::remove_all(scratch);
}
