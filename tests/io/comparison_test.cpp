// Comparison of a base run and variants: the best run per layer (lowest peak
// among the runs that completed, ties by margin), absent layers shown as
// absent rather than zero, and the three files read back.
#include "io_fixtures.hpp"

#include "plystrain/solver/comparison.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

#include <fstream>

namespace {

using plystrain::NamedRun;
using plystrain::RunResults;

RunResults completed_run(double absorber_peak, double absorber_onset) {
  RunResults run = plystrain::test::sample_run();
  run.completed = true;
  run.load_reached = 1.0;
  run.message.clear();
  plystrain::LayerResult& absorber = run.layers[1];
  absorber.peak_strain = absorber_peak;
  absorber.crack_onset_strain = absorber_onset;
  absorber.crack_margin = 1.0 - absorber_peak / absorber_onset;
  absorber.verdict = plystrain::judge(absorber_peak, absorber_onset, absorber.yield_strain);
  return run;
}

std::vector<std::string> read_lines(const std::filesystem::path& path) {
  std::ifstream in(path);
  std::vector<std::string> lines;
  std::string line;
  while (std::getline(in, line)) {
    lines.push_back(line);
  }
  return lines;
}

std::vector<std::string> split(const std::string& line) {
  std::vector<std::string> fields;
  std::size_t start = 0;
  while (true) {
    const std::size_t comma = line.find(',', start);
    fields.push_back(line.substr(start, comma - start));
    if (comma == std::string::npos) {
      return fields;
    }
    start = comma + 1;
  }
}

}  // namespace

TEST_CASE("the best run of a layer is the lowest peak among completed runs", "[comparison]") {
  const RunResults base = completed_run(0.30, 0.2);
  RunResults stopped = completed_run(0.01, 0.2);  // lowest, but did not finish
  stopped.completed = false;
  stopped.load_reached = 0.3;
  const std::vector<NamedRun> variants = {
      {"thicker", completed_run(0.15, 0.2)},
      {"stopped", stopped},
  };
  const plystrain::Comparison comparison = plystrain::compare_runs(base, variants);
  REQUIRE(comparison.runs.size() == 3);
  CHECK(comparison.runs[0].name == "base");
  CHECK(comparison.layers == std::vector<std::string>{"substrate", "absorber"});
  CHECK(comparison.entries.size() == 6);
  CHECK(comparison.entry("thicker", "absorber").best);
  CHECK_FALSE(comparison.entry("base", "absorber").best);
  CHECK_FALSE(comparison.entry("stopped", "absorber").best);
  CHECK(comparison.entry("base", "absorber").verdict == plystrain::Verdict::cracks);
  CHECK(comparison.entry("thicker", "absorber").verdict == plystrain::Verdict::yields);
}

TEST_CASE("equal peaks are decided by the larger crack margin", "[comparison]") {
  const RunResults base = completed_run(0.15, 0.2);
  const std::vector<NamedRun> variants = {
      {"tougher", completed_run(0.15, 0.3)},  // same peak, margin 0.5 against 0.25
      {"same", completed_run(0.15, 0.2)},
  };
  const plystrain::Comparison comparison = plystrain::compare_runs(base, variants);
  CHECK(comparison.entry("tougher", "absorber").best);
  CHECK_FALSE(comparison.entry("base", "absorber").best);
  CHECK_FALSE(comparison.entry("same", "absorber").best);
  // All three substrates are identical: every one is best.
  CHECK(comparison.entry("base", "substrate").best);
  CHECK(comparison.entry("tougher", "substrate").best);
  CHECK(comparison.entry("same", "substrate").best);
}

TEST_CASE("a layer removed in a variant is absent, not zero, in every file", "[comparison]") {
  const plystrain::test::ScratchDirectory scratch("comparison");
  const RunResults base = completed_run(0.30, 0.2);
  RunResults without = completed_run(0.30, 0.2);
  without.layers.pop_back();  // no absorber
  const plystrain::Comparison comparison =
      plystrain::compare_runs(base, {{"no-absorber", without}});
  const plystrain::ComparisonEntry& absent = comparison.entry("no-absorber", "absorber");
  CHECK_FALSE(absent.present);
  CHECK_FALSE(absent.peak_strain.has_value());
  CHECK_FALSE(absent.best);
  CHECK(comparison.entry("base", "absorber").best);

  plystrain::write_comparison_files(scratch.path(), comparison);
  const std::vector<std::string> csv = read_lines(scratch.path() / "comparison.csv");
  REQUIRE(csv.size() == 5);
  CHECK(csv[0] == "variant,layer,peak_strain,concentration,crack_margin,verdict,best,completed");
  CHECK(csv[4] == "no-absorber,absorber,,,,absent,false,true");
  const std::vector<std::string> fields = split(csv[2]);
  REQUIRE(fields.size() == 8);
  const plystrain::ComparisonEntry& base_absorber = comparison.entry("base", "absorber");
  CHECK(fields[0] == "base");
  CHECK(fields[1] == "absorber");
  CHECK(std::stod(fields[2]) == 0.30);
  CHECK(std::stod(fields[3]) == *base_absorber.concentration);
  CHECK(std::stod(fields[4]) == *base_absorber.crack_margin);
  CHECK(fields[5] == "cracks");
  CHECK(fields[6] == "true");
  CHECK(fields[7] == "true");

  std::ifstream json_file(scratch.path() / "comparison.json");
  const nlohmann::json document = nlohmann::json::parse(json_file);
  REQUIRE(document["rows"].size() == 4);
  const nlohmann::json& row = document["rows"][3];
  CHECK(row["variant"] == "no-absorber");
  CHECK(row["present"] == false);
  CHECK(row["peak_strain"].is_null());
  CHECK(row["verdict"].is_null());
  CHECK(document["best"]["absorber"] == nlohmann::json::array({"base"}));
  CHECK(document["runs"][1]["completed"] == true);
  // 0.1 + 0.2 style values survive: the base peak is exactly 0.3 here.
  CHECK(document["rows"][1]["peak_strain"].get<double>() == 0.30);

  std::ifstream text_file(scratch.path() / "comparison.txt");
  const std::string text(std::istreambuf_iterator<char>(text_file), {});
  CHECK(text.find("Layer absorber") != std::string::npos);
  CHECK(text.find("no-absorber  absent") != std::string::npos);
  CHECK(text.find("<- best") != std::string::npos);
  CHECK(text.find("CRACKS") != std::string::npos);
}

TEST_CASE("two runs with one name are refused", "[comparison]") {
  const RunResults base = completed_run(0.30, 0.2);
  CHECK_THROWS_AS(plystrain::compare_runs(base, {{"base", base}}), std::invalid_argument);
}

TEST_CASE("no best run when none completed", "[comparison]") {
  RunResults base = completed_run(0.30, 0.2);
  base.completed = false;
  const plystrain::Comparison comparison = plystrain::compare_runs(base, {});
  for (const plystrain::ComparisonEntry& entry : comparison.entries) {
    CHECK_FALSE(entry.best);
  }
  const std::string text = plystrain::comparison_text(comparison);
  CHECK(text.find("STOPPED EARLY") != std::string::npos);
}
