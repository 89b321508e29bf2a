// summary.txt / terminal table: the headline, the verdict table and the
// detail table (the figures of results-format.md), a crack that cannot be
// missed, the completion or early-stop line and the cautions.
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

TEST_CASE("the tables show each layer's figures in % and the case unit", "[summary]") {
  const plystrain::RunResults run = plystrain::test::sample_run();
  const std::string text = plystrain::format_results_table(run, {"mm", 1000.0});
  const std::string header = line_containing(text, "conc.");
  for (const char* column : {"layer", "%", "conc.", "margin", "load %", "verdict"}) {
    INFO(column);
    CHECK(header.find(column) != std::string::npos);
  }
  const std::string top = line_containing(text, "crack at");
  for (const char* column : {"peak", "min", "crack", "yield", "yield at"}) {
    INFO(column);
    CHECK(top.find(column) != std::string::npos);
  }
  const std::string details = line_containing(text, "undisturbed %");
  for (const char* column :
       {"peak at (x, z) mm", "undisturbed %", "stress MPa", "onset %", "yield %", "basis"}) {
    INFO(column);
    CHECK(details.find(column) != std::string::npos);
  }
  // The first line naming the absorber is its row of the verdict table: peak
  // 0.30000000000000004 -> "30.000" %, concentration 0.3 / 0.25 = 1.2, min
  // -11.000 %, crack margin 1 - 0.3 / 0.2 = -0.5, yield margin
  // 1 - 0.3 / 0.04 = -6.5.
  const std::string absorber = line_containing(text, "absorber  ");
  CHECK(absorber.find("30.000") != std::string::npos);
  CHECK(absorber.find("1.2") != std::string::npos);
  CHECK(absorber.find("-11.000") != std::string::npos);
  CHECK(absorber.find("-0.500") != std::string::npos);
  CHECK(absorber.find("-6.500") != std::string::npos);
  // Its row of the detail table: at (1000, 150.21) um = (1, 0.15021) mm,
  // far field 25 %, crack onset 20 %, yield 4 %, the basis.
  INFO(text);
  const std::string placed = line_containing(text, "(1, 0.15021)");
  CHECK(placed.find("absorber") != std::string::npos);
  CHECK(placed.find("25.000") != std::string::npos);
  CHECK(placed.find("20.000") != std::string::npos);
  CHECK(placed.find("4.000") != std::string::npos);
  CHECK(placed.find("invented for a test") != std::string::npos);
  const std::string substrate = line_containing(text, "substrate  ");
  // A layer without limits says so in words, not "unknown".
  CHECK(substrate.find("no limit data") != std::string::npos);
  CHECK(substrate.find("unknown") == std::string::npos);
  CHECK(substrate.find(" - ") != std::string::npos);  // absent concentration and margins
}

TEST_CASE("the layer tables fit a 100-column terminal", "[summary]") {
  // The project's line-length limit (.clang-format, 100 columns) is also the
  // width a reader's terminal is assumed to have (common practice).
  plystrain::RunResults run = plystrain::test::sample_run();
  plystrain::LayerResult long_name = plystrain::test::cracked_absorber();
  long_name.name = "electron-transport";  // the longest layer name of the example cases
  long_name.crack_onset_load_factor = 0.123456;
  long_name.yield_load_factor = 0.0123456;
  run.layers.push_back(long_name);
  for (plystrain::LayerResult& layer : run.layers) {
    layer.basis = "from-memory";  // the longest basis of the built-in library
  }
  const std::string text = plystrain::format_results_table(run, {"um", 1.0});
  const std::size_t start = text.find("  layer");
  const std::size_t end = text.find("\nCRACKS");
  REQUIRE(start != std::string::npos);
  REQUIRE(end != std::string::npos);
  std::istringstream lines(text.substr(start, end - start));
  std::string line;
  int checked = 0;
  while (std::getline(lines, line)) {
    INFO(line);
    CHECK(line.size() <= 100);
    ++checked;
  }
  CHECK(checked >= 8);  // two header lines, three rows, a blank, the detail header and rows
}

TEST_CASE("the headline comes first: counts and names of the layers that crack and yield",
          "[summary][headline]") {
  // Four layers: two crack (peak at or above crack onset), one yields (above
  // its yield strain, below crack onset), one has no limit data (verdict
  // rules of results-format.md).
  plystrain::RunResults run = plystrain::test::sample_run();
  run.completed = true;
  run.load_reached = 1.0;
  run.message.clear();
  plystrain::LayerResult electrode = plystrain::test::cracked_absorber();
  electrode.name = "electrode";
  plystrain::LayerResult sensing = plystrain::test::cracked_absorber();
  sensing.name = "sensing";
  plystrain::LayerResult cap = plystrain::test::cracked_absorber();
  cap.name = "cap";
  cap.peak_strain = 0.1;
  cap.verdict = plystrain::judge(cap.peak_strain, cap.crack_onset_strain, cap.yield_strain);
  REQUIRE(cap.verdict == plystrain::Verdict::yields);
  run.layers = {plystrain::test::substrate_without_limits(), electrode, sensing, cap};

  const std::string expected =
      "2 of 4 layers crack: electrode, sensing; 1 yields: cap; 1 layer without limit data: "
      "substrate; load reached 100 %";
  CHECK(plystrain::headline(run) == expected);
  CHECK(plystrain::overall_verdict(run) == plystrain::Verdict::cracks);
  const std::string text = plystrain::format_results_table(run, {"um", 1.0});
  CHECK(text.rfind(expected + "\n", 0) == 0);  // the very first line
}

TEST_CASE("the headline of an intact stack, and of a run that stopped early",
          "[summary][headline]") {
  plystrain::RunResults run = plystrain::test::sample_run();
  plystrain::LayerResult film = plystrain::test::cracked_absorber();
  film.peak_strain = 0.01;  // below the yield strain of 0.04: intact
  film.verdict = plystrain::judge(film.peak_strain, film.crack_onset_strain, film.yield_strain);
  plystrain::LayerResult cover = film;
  cover.name = "cover";
  run.layers = {film, cover};
  run.completed = true;
  run.load_reached = 1.0;
  CHECK(plystrain::headline(run) == "all 2 layers intact; load reached 100 %");
  CHECK(plystrain::overall_verdict(run) == plystrain::Verdict::intact);

  // sample_run stopped at load factor 0.625 = 62.5 % of the full load.
  run.completed = false;
  run.load_reached = 0.625;
  run.layers.push_back(plystrain::test::substrate_without_limits());
  CHECK(plystrain::headline(run) ==
        "2 of 3 layers intact; 1 layer without limit data: substrate; load stopped at 62.5 %; the "
        "verdicts are for that state");
}

TEST_CASE("a layer cracked only in a local check counts in the headline", "[summary][headline]") {
  plystrain::RunResults run = plystrain::test::sample_run();
  run.completed = true;
  run.load_reached = 1.0;
  plystrain::LayerResult absorber = plystrain::test::cracked_absorber();
  absorber.peak_strain = 0.01;
  absorber.verdict = plystrain::judge(0.01, absorber.crack_onset_strain, absorber.yield_strain);
  run.layers = {plystrain::test::substrate_without_limits(), absorber};
  plystrain::LocalCheck check;
  check.defect_index = 1;
  check.layers = {plystrain::test::cracked_absorber()};
  run.local = {check};
  CHECK(plystrain::headline(run) ==
        "1 of 2 layers cracks: absorber; 1 layer without limit data: substrate; load reached "
        "100 %");
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
