// The command line: exit codes, messages and listings as the README documents them.
#include "cli/cli_support.hpp"

#include "plystrain/solver/material_library.hpp"

#include <catch2/catch.hpp>

#include <filesystem>

using plystrain::test::data_path;
using plystrain::test::run_plystrain;

TEST_CASE("the version option names the program and its version", "[cli]") {
  const auto result = run_plystrain("--version");
  CHECK(result.exit_code == 0);
  CHECK(result.out.find(std::string("plystrain ") + PLYSTRAIN_VERSION) != std::string::npos);
}

TEST_CASE("the help option lists every command", "[cli]") {
  const auto result = run_plystrain("--help");
  CHECK(result.exit_code == 0);
  for (const char* command : {"check", "materials", "reference", "mesh", "run"}) {
    CHECK(result.out.find(command) != std::string::npos);
  }
  for (const char* command : {"check", "materials", "reference", "mesh", "run"}) {
    const auto help = run_plystrain(std::string(command) + " --help");
    CHECK(help.exit_code == 0);
    CHECK(help.out.find("Usage") != std::string::npos);
  }
}

TEST_CASE("a command-line mistake is bad input (exit 2)", "[cli]") {
  CHECK(run_plystrain("").exit_code == 2);
  CHECK(run_plystrain("no-such-command").exit_code == 2);
  CHECK(run_plystrain("check").exit_code == 2);
}

TEST_CASE("check accepts every example case and prints the stack bottom to top", "[cli]") {
  const std::filesystem::path cases = std::filesystem::path(PLYSTRAIN_SOURCE_DIR) / "cases";
  int checked = 0;
  for (const auto& entry : std::filesystem::directory_iterator(cases)) {
    const std::filesystem::path file = entry.path() / "case.toml";
    if (!std::filesystem::exists(file)) {
      continue;
    }
    const auto result = run_plystrain("check '" + file.string() + "'");
    INFO(file.string() << "\n" << result.err);
    CHECK(result.exit_code == 0);
    CHECK(result.out.find("bottom (1) to top") != std::string::npos);
    CHECK(result.out.find("The case is valid.") != std::string::npos);
    ++checked;
  }
  CHECK(checked >= 4);
}

TEST_CASE("check refuses a malformed case with exit 2, naming file and line", "[cli]") {
  // Each file marks the expected line; the reader's own tests check every
  // class of error, this one checks that the command line passes them on.
  for (const char* name : {"unknown-key.toml", "wrong-type.toml", "unknown-material.toml",
                           "syntax-error.toml", "defect-outside-width.toml"}) {
    const std::string file = data_path(std::string("cases/bad/") + name);
    const auto result = run_plystrain("check '" + file + "'");
    INFO(name << ": " << result.err);
    CHECK(result.exit_code == 2);
    CHECK(result.err.find(std::string(name) + ":") != std::string::npos);
    CHECK(result.out.find("The case is valid.") == std::string::npos);
  }
  const auto missing = run_plystrain("check /nonexistent/case.toml");
  CHECK(missing.exit_code == 2);
}

TEST_CASE("materials lists every entry of the library, and one key shows its source", "[cli]") {
  const plystrain::MaterialLibrary library = plystrain::load_builtin_library();
  const auto listing = run_plystrain("materials");
  REQUIRE(listing.exit_code == 0);
  for (const std::string& key : library.keys()) {
    CHECK(listing.out.find(key) != std::string::npos);
  }
  const auto one = run_plystrain("materials silicone-10to1");
  CHECK(one.exit_code == 0);
  CHECK(one.out.find(library.find("silicone-10to1")->source.substr(0, 20)) != std::string::npos);

  const auto misspelt = run_plystrain("materials silicone-10to2");
  CHECK(misspelt.exit_code == 2);
  CHECK(misspelt.err.find("silicone-10to1") != std::string::npos);
}

TEST_CASE("reference prints the generated case-format reference", "[cli]") {
  const auto result = run_plystrain("reference");
  CHECK(result.exit_code == 0);
  const std::string committed = plystrain::test::read_text(
      std::filesystem::path(PLYSTRAIN_SOURCE_DIR) / "docs" / "case-format-reference.md");
  CHECK(result.out == committed);
}

TEST_CASE("mesh writes mesh.msh and mesh.vtu and prints the quality table", "[cli]") {
  const std::filesystem::path out = plystrain::test::fresh_output_dir("mesh");
  const auto result = run_plystrain("mesh '" + data_path("cli/homogeneous-strip-free.toml") +
                                    "' --out '" + out.string() + "'");
  INFO(result.err);
  CHECK(result.exit_code == 0);
  CHECK(std::filesystem::exists(out / "mesh.msh"));
  CHECK(std::filesystem::exists(out / "mesh.vtu"));
  CHECK(result.out.find("min scaled Jacobian") != std::string::npos);
  std::filesystem::remove_all(out);
}

TEST_CASE("every example case meshes without inverted cells", "[cli]") {
  // `mesh` refuses inverted cells with an error (exit 2), so exit 0 and a
  // quality table with no non-positive Jacobian mean a valid mesh.
  const std::filesystem::path cases = std::filesystem::path(PLYSTRAIN_SOURCE_DIR) / "cases";
  int meshed = 0;
  for (const auto& entry : std::filesystem::directory_iterator(cases)) {
    const std::filesystem::path file = entry.path() / "case.toml";
    if (!std::filesystem::exists(file)) {
      continue;
    }
    const std::filesystem::path out =
        plystrain::test::fresh_output_dir("mesh-" + entry.path().filename().string());
    const auto result = run_plystrain("mesh '" + file.string() + "' --out '" + out.string() + "'");
    INFO(file.string() << "\n" << result.out << result.err);
    CHECK(result.exit_code == 0);
    CHECK(std::filesystem::exists(out / "mesh.vtu"));
    std::filesystem::remove_all(out);
    ++meshed;
  }
  CHECK(meshed >= 4);
}
