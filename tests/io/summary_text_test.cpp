// summary.txt / terminal table: the columns of results-format.md, a crack
// that cannot be missed, the completion or early-stop line and the cautions.
#include "io_fixtures.hpp"

#include "plystrain/solver/results_writers.hpp"

#include <catch2/catch.hpp>

#include <fstream>
#include <sstream>

namespace {

std::string read_text(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::stringstream buffer;
  buffer << in.rdbuf();
  return buffer.str();
}

std::string line_containing(const std::string& text, const std::string& needle) {
  std::istringstream lines(text);
  std::string line;
  while (std::getline(lines, line)) {
    if (line.find(needle) != std::string::npos) {
      return line;
    }
  }
  return {};
}

}  // namespace

TEST_CASE("the table shows each layer's figures in % and the case unit", "[summary]") {
  const plystrain::RunResults run = plystrain::test::sample_run();
  const std::string text = plystrain::format_results_table(run, {"mm", 1000.0});
  const std::string header = line_containing(text, "peak %");
  for (const char* column : {"layer", "peak %", "at (x, z) mm", "undisturbed %", "conc.", "min %",
                             "stress MPa", "crack onset %", "margin", "verdict", "basis"}) {
    INFO(column);
    CHECK(header.find(column) != std::string::npos);
  }
  const std::string absorber = line_containing(text, "absorber  ");
  // 0.30000000000000004 -> "30.000" %, at (1000, 150.21) um = (1, 0.15021) mm,
  // concentration 1.2, margin 1 - 0.3 / 0.2 = -0.5.
  CHECK(absorber.find("30.000") != std::string::npos);
  CHECK(absorber.find("(1, 0.15021)") != std::string::npos);
  CHECK(absorber.find("1.2") != std::string::npos);
  CHECK(absorber.find("-0.500") != std::string::npos);
  CHECK(absorber.find("20.000") != std::string::npos);
  CHECK(absorber.find("invented for a test") != std::string::npos);
  const std::string substrate = line_containing(text, "substrate  ");
  CHECK(substrate.find("unknown") != std::string::npos);
  CHECK(substrate.find(" - ") != std::string::npos);  // absent concentration and limits
}

TEST_CASE("a cracked layer is marked in capitals and named below the table", "[summary]") {
  const plystrain::RunResults run = plystrain::test::sample_run();
  const std::string text = plystrain::format_results_table(run, {"um", 1.0});
  const std::string absorber = line_containing(text, "absorber  ");
  CHECK(absorber.find("CRACKS") != std::string::npos);
  CHECK(absorber.rfind(">>", 4) != std::string::npos);
  const std::string named = line_containing(text, "CRACKS: expected to crack:");
  CHECK(named.find("absorber") != std::string::npos);
  CHECK(named.find("substrate") == std::string::npos);
  CHECK(text.find('\x1b') == std::string::npos);  // no terminal escape codes
}

TEST_CASE("a layer cracked only at a defect is still named", "[summary]") {
  plystrain::RunResults run = plystrain::test::sample_run();
  run.layers = {plystrain::test::substrate_without_limits()};
  plystrain::LocalCheck check;
  check.defect_index = 1;
  check.layers = {plystrain::test::cracked_absorber()};
  run.local = {check};
  const std::string text = plystrain::format_results_table(run, {"um", 1.0});
  CHECK(text.find("Local check at defect 1") != std::string::npos);
  CHECK(line_containing(text, "CRACKS: expected to crack:").find("absorber") != std::string::npos);
}

TEST_CASE("the table says why a run stopped and how far it got", "[summary]") {
  const plystrain::RunResults stopped = plystrain::test::sample_run();
  const std::string text = plystrain::format_results_table(stopped, {"um", 1.0});
  const std::string line = line_containing(text, "STOPPED EARLY");
  CHECK(line.find("load factor 0.625") != std::string::npos);
  CHECK(line.find(stopped.message) != std::string::npos);

  plystrain::RunResults finished = stopped;
  finished.completed = true;
  finished.load_reached = 1.0;
  finished.message.clear();
  finished.layers = {plystrain::test::substrate_without_limits()};
  const std::string done = plystrain::format_results_table(finished, {"um", 1.0});
  CHECK(done.find("STOPPED") == std::string::npos);
  CHECK(line_containing(done, "Completed").find("load factor 1") != std::string::npos);
  CHECK(done.find("No layer reaches its crack-onset strain.") != std::string::npos);
}

TEST_CASE("summary.txt carries the run's and the standard cautions", "[summary]") {
  const plystrain::test::ScratchDirectory scratch("summary");
  const plystrain::RunResults run = plystrain::test::sample_run();
  const std::filesystem::path path = scratch.path() / "summary.txt";
  plystrain::write_summary_text(path, run, {"um", 1.0});
  const std::string text = read_text(path);
  CHECK(text == plystrain::format_results_table(run, {"um", 1.0}));
  CHECK(text.find("A run-specific caution.") != std::string::npos);
  for (const std::string& caution : plystrain::standard_cautions()) {
    CHECK(text.find(caution) != std::string::npos);
  }
  const std::vector<std::string> cautions = plystrain::standard_cautions();
  CHECK(cautions.front().find("physical testing") != std::string::npos);
  CHECK(cautions.back().find("biocompatibility") != std::string::npos);
}
