// Comparison of a base run and variants: the best run per layer (widest
// crack margin among the runs that completed, then yield margin, then lowest
// peak), absent layers shown as absent rather than zero, and the files read
// back; a sweep's combined table.
#include "io_fixtures.hpp"
#include "text_support.hpp"

#include "plystrain/solver/comparison.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

#include <fstream>

using plystrain::test::read_lines;
using plystrain::test::split;

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
  absorber.yield_margin = 1.0 - absorber_peak / *absorber.yield_strain;
  absorber.verdict = plystrain::judge(absorber_peak, absorber_onset, absorber.yield_strain);
  return run;
}

}  // namespace

TEST_CASE("the best run of a layer has the widest margin among completed runs", "[comparison]") {
  // The same material throughout: the widest crack margin is the lowest peak.
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

TEST_CASE("the widest margin wins over the lowest peak", "[comparison]") {
  // Two materials: "low-peak" strains least (10 %) but its film cracks at
  // 12 %, margin 1 - 0.10 / 0.12 = 0.167; "tough" strains 15 % against an
  // onset of 50 %, margin 1 - 0.15 / 0.5 = 0.7. The margin decides.
  const RunResults base = completed_run(0.30, 0.2);
  const std::vector<NamedRun> variants = {
      {"low-peak", completed_run(0.10, 0.12)},
      {"tough", completed_run(0.15, 0.5)},
  };
  const plystrain::Comparison comparison = plystrain::compare_runs(base, variants);
  CHECK(comparison.entry("tough", "absorber").best);
  CHECK_FALSE(comparison.entry("low-peak", "absorber").best);
  CHECK_FALSE(comparison.entry("base", "absorber").best);
  CHECK(plystrain::comparison_text(comparison).find("widest crack margin") != std::string::npos);
}

TEST_CASE("equal crack margins go to the wider yield margin, then the lower peak", "[comparison]") {
  // Crack margins both 1 - 0.1 / 0.2 = 1 - 0.15 / 0.3 = 0.5; yield margins
  // 1 - 0.1 / 0.04 = -1.5 against 1 - 0.15 / 0.04 = -2.75: the lower peak's
  // yield margin is wider. Without any yield strain the lower peak decides.
  RunResults first = completed_run(0.10, 0.2);
  RunResults second = completed_run(0.15, 0.3);
  plystrain::Comparison comparison = plystrain::compare_runs(first, {{"second", second}});
  CHECK(comparison.entry("base", "absorber").best);
  CHECK_FALSE(comparison.entry("second", "absorber").best);

  for (RunResults* run : {&first, &second}) {
    run->layers[1].yield_strain.reset();
    run->layers[1].yield_margin.reset();
  }
  // Equal crack margins, no yield margins, peaks 1e-6 apart: the lower wins.
  second.layers[1].peak_strain = 0.1 * (1.0 + 1e-6);
  second.layers[1].crack_margin = first.layers[1].crack_margin;
  comparison = plystrain::compare_runs(first, {{"second", second}});
  CHECK(comparison.entry("base", "absorber").best);
  CHECK_FALSE(comparison.entry("second", "absorber").best);
}

TEST_CASE("without limit data the lowest peak is best, and a margin beats none", "[comparison]") {
  // The substrate has no limits in sample_run: peaks 0.05 against 0.04.
  const RunResults base = completed_run(0.30, 0.2);
  RunResults softer = completed_run(0.30, 0.2);
  softer.layers[0].peak_strain = 0.04;
  plystrain::Comparison comparison = plystrain::compare_runs(base, {{"softer", softer}});
  CHECK(comparison.entry("softer", "substrate").best);
  CHECK_FALSE(comparison.entry("base", "substrate").best);
  // A run whose layer has a crack margin (even a negative one) is judged;
  // one without limit data cannot be judged better.
  RunResults judged = completed_run(0.30, 0.2);
  judged.layers[0].crack_onset_strain = 0.01;
  judged.layers[0].crack_margin = 1.0 - 0.05 / 0.01;
  comparison = plystrain::compare_runs(base, {{"softer", softer}, {"judged", judged}});
  CHECK(comparison.entry("judged", "substrate").best);
  CHECK_FALSE(comparison.entry("softer", "substrate").best);
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
  // The original columns first, the additions after them
  // (results-format-notes.md).
  CHECK(csv[0] ==
        "variant,layer,peak_strain,concentration,crack_margin,verdict,best,completed,yield_margin,"
        "crack_onset_load_factor,yield_load_factor");
  CHECK(csv[4] == "no-absorber,absorber,,,,absent,false,true,,,");
  const std::vector<std::string> fields = split(csv[2]);
  REQUIRE(fields.size() == 11);
  const plystrain::ComparisonEntry& base_absorber = comparison.entry("base", "absorber");
  CHECK(fields[0] == "base");
  CHECK(fields[1] == "absorber");
  CHECK(std::stod(fields[2]) == 0.30);
  CHECK(std::stod(fields[3]) == *base_absorber.concentration);
  CHECK(std::stod(fields[4]) == *base_absorber.crack_margin);
  CHECK(fields[5] == "cracks");
  CHECK(fields[6] == "true");
  CHECK(fields[7] == "true");
  CHECK(std::stod(fields[8]) == *base_absorber.yield_margin);
  CHECK(std::stod(fields[9]) == 0.55);  // cracked_absorber's first-crack load factor
  CHECK(std::stod(fields[10]) == 0.11);

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

TEST_CASE("a sweep's combined table: one row per value and layer", "[comparison][sweep]") {
  const plystrain::test::ScratchDirectory scratch("sweep");
  const std::vector<NamedRun> runs = {
      {"sweep-1", completed_run(0.10, 0.2)},
      {"sweep-2", completed_run(0.30, 0.2)},
  };
  plystrain::Comparison sweep = plystrain::compare_runs(runs);
  sweep.runs[0].value = "0.05";
  sweep.runs[1].value = "0.15";
  plystrain::write_sweep_files(scratch.path(), sweep, "load.strain");
  const std::vector<std::string> csv = read_lines(scratch.path() / "sweep.csv");
  REQUIRE(csv.size() == 1 + 2 * 2);
  CHECK(csv[0] ==
        "run,parameter,value,layer,peak_strain,concentration,crack_margin,yield_margin,verdict,"
        "crack_onset_load_factor,yield_load_factor,best,completed");
  const std::vector<std::string> row = split(csv[4]);
  REQUIRE(row.size() == 13);
  CHECK(row[0] == "sweep-2");
  CHECK(row[1] == "load.strain");
  CHECK(row[2] == "0.15");
  CHECK(row[3] == "absorber");
  CHECK(std::stod(row[4]) == 0.30);
  CHECK(std::stod(row[6]) == 1.0 - 0.30 / 0.2);   // crack margin
  CHECK(std::stod(row[7]) == 1.0 - 0.30 / 0.04);  // yield margin
  CHECK(row[8] == "cracks");
  CHECK(std::stod(row[9]) == 0.55);
  CHECK(row[11] == "false");  // the smaller value leaves the wider margin

  std::ifstream json_file(scratch.path() / "sweep.json");
  const nlohmann::json document = nlohmann::json::parse(json_file);
  CHECK(document["parameter"] == "load.strain");
  REQUIRE(document["runs"].size() == 2);
  CHECK(document["runs"][0]["name"] == "sweep-1");
  CHECK(document["runs"][0]["value"] == "0.05");
  CHECK(document["runs"][1]["verdict"] == "cracks");
  REQUIRE(document["rows"].size() == 4);
  CHECK(document["rows"][3]["run"] == "sweep-2");
  CHECK(document["rows"][3]["value"] == "0.15");
  CHECK(document["rows"][3]["yield_margin"].get<double>() == 1.0 - 0.30 / 0.04);
  CHECK(document["best"]["absorber"] == nlohmann::json::array({"sweep-1"}));
  CHECK(std::filesystem::exists(scratch.path() / "sweep.txt"));
}
