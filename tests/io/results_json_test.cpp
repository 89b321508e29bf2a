// results.json read back with nlohmann::json: every key of results-format.md
// (the project's output contract) present with its documented type, nulls
// where optional values are absent, lengths in the case's unit and numbers
// that round-trip exactly.
#include "io_fixtures.hpp"

#include "plystrain/solver/results_writers.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

#include <fstream>
#include <limits>

namespace {

using nlohmann::json;

json read_json(const std::filesystem::path& path) {
  std::ifstream in(path);
  REQUIRE(in);
  return json::parse(in);
}

void check_layer_types(const json& layer) {
  for (const char* key : {"name", "role", "material", "basis", "verdict"}) {
    INFO(key);
    REQUIRE(layer.contains(key));
    CHECK(layer[key].is_string());
  }
  for (const char* key : {"thickness", "peak_strain", "raw_peak_strain", "far_field_strain",
                          "min_strain", "peak_stress"}) {
    INFO(key);
    REQUIRE(layer.contains(key));
    CHECK(layer[key].is_number());
  }
  for (const char* key : {"concentration", "crack_onset_strain", "yield_strain", "crack_margin",
                          "yield_margin", "crack_onset_load_factor", "yield_load_factor"}) {
    INFO(key);
    REQUIRE(layer.contains(key));
    CHECK((layer[key].is_number() || layer[key].is_null()));
  }
  REQUIRE(layer["peak_at"].is_array());
  CHECK(layer["peak_at"].size() == 2);
}

}  // namespace

TEST_CASE("results.json has every documented key with its type", "[results_json]") {
  const plystrain::test::ScratchDirectory scratch("results-json");
  const plystrain::RunResults run = plystrain::test::sample_run();
  const std::filesystem::path path = scratch.path() / "results.json";
  plystrain::write_results_json(path, run, {"mm", 1000.0});
  const json document = read_json(path);

  CHECK(document["format"] == 1);
  CHECK(document["tool_version"] == "0.1.0");
  CHECK(document["case"] == "sample.toml");
  CHECK(document["case_hash"] == "0123456789abcdef");
  CHECK(document["title"] == "Sample stack");
  CHECK(document["units"] == "mm");
  CHECK(document["model"] == json{{"shape", "strip"}, {"load", "stretch"}, {"lateral", "free"}});
  CHECK(document["completed"] == false);
  CHECK(document["load_reached"] == 0.625);
  CHECK(document["message"] == run.message);
  REQUIRE(document["layers"].is_array());
  REQUIRE(document["layers"].size() == 2);
  for (const json& layer : document["layers"]) {
    check_layer_types(layer);
  }
  CHECK(document["local"] == json::array());
  CHECK(document["conform"].is_null());
  CHECK(document["mesh"] ==
        json{{"nodes", 1234}, {"elements", 300}, {"unknowns", 2468}, {"min_quality", 0.75}});
  CHECK(document["solver"] ==
        json{{"increments", 8}, {"newton_iterations", 31}, {"cutbacks", 2}, {"seconds", 1.5}});
  REQUIRE(document["cautions"].is_array());
  // The run's own caution first, then the standard ones.
  CHECK(document["cautions"][0] == "A run-specific caution.");
  CHECK(document["cautions"].size() == 1 + plystrain::standard_cautions().size());
  CHECK(document["overall_verdicts"] == json{{"substrate", "unknown"}, {"absorber", "cracks"}});
  // The overall verdict is the worst over the layers (cracks over unknown,
  // results-format-notes.md); the headline is the summary's first line.
  CHECK(document["verdict"] == "cracks");
  CHECK(document["headline"] == plystrain::headline(run));
  CHECK(document["headline"].get<std::string>().find("1 of 2 layers cracks: absorber") == 0);
}

TEST_CASE("results.json: overall verdict unknown only when no layer has limit data",
          "[results_json]") {
  plystrain::RunResults run = plystrain::test::sample_run();
  run.layers = {plystrain::test::substrate_without_limits()};
  CHECK(json::parse(plystrain::results_json_text(run, {"um", 1.0}))["verdict"] == "unknown");
  plystrain::LayerResult film = plystrain::test::cracked_absorber();
  film.peak_strain = 0.01;
  film.verdict = plystrain::judge(0.01, film.crack_onset_strain, film.yield_strain);
  run.layers.push_back(film);
  CHECK(json::parse(plystrain::results_json_text(run, {"um", 1.0}))["verdict"] == "intact");
}

TEST_CASE("results.json layer values: nulls, case unit and exact round trip", "[results_json]") {
  const plystrain::test::ScratchDirectory scratch("results-json-values");
  const plystrain::RunResults run = plystrain::test::sample_run();
  const std::filesystem::path path = scratch.path() / "results.json";
  plystrain::write_results_json(path, run, {"mm", 1000.0});
  const json document = read_json(path);

  const json& substrate = document["layers"][0];
  CHECK(substrate["name"] == "substrate");
  CHECK(substrate["concentration"].is_null());
  CHECK(substrate["crack_onset_strain"].is_null());
  CHECK(substrate["yield_strain"].is_null());
  CHECK(substrate["crack_margin"].is_null());
  CHECK(substrate["yield_margin"].is_null());
  CHECK(substrate["crack_onset_load_factor"].is_null());
  CHECK(substrate["yield_load_factor"].is_null());
  CHECK(substrate["verdict"] == "unknown");
  CHECK(substrate["thickness"].get<double>() == 150.0 / 1000.0);

  const plystrain::LayerResult expected = plystrain::test::cracked_absorber();
  const json& absorber = document["layers"][1];
  CHECK(absorber["verdict"] == "cracks");
  // Doubles must come back bit for bit (17 significant digits needed here).
  CHECK(absorber["peak_strain"].get<double>() == expected.peak_strain);
  CHECK(absorber["concentration"].get<double>() == *expected.concentration);
  CHECK(absorber["crack_margin"].get<double>() == *expected.crack_margin);
  // yield_margin = 1 - peak / yield strain (results-format-notes.md).
  CHECK(absorber["yield_margin"].get<double>() == 1.0 - expected.peak_strain / 0.04);
  CHECK(absorber["crack_onset_load_factor"].get<double>() == 0.55);
  CHECK(absorber["yield_load_factor"].get<double>() == 0.11);
  CHECK(absorber["crack_onset_strain"].get<double>() == 0.2);
  CHECK(absorber["yield_strain"].get<double>() == 0.04);
  CHECK(absorber["raw_peak_strain"].get<double>() == 0.45);
  // Lengths in the case unit (mm): micrometres / 1000.
  CHECK(absorber["thickness"].get<double>() == 0.12 / 1000.0);
  CHECK(absorber["peak_at"][0].get<double>() == 1000.0 / 1000.0);
  CHECK(absorber["peak_at"][1].get<double>() == 150.21 / 1000.0);
}

TEST_CASE("results.json local checks and conform block", "[results_json]") {
  const plystrain::test::ScratchDirectory scratch("results-json-conform");
  plystrain::RunResults run = plystrain::test::sample_run();
  run.completed = true;
  run.load_reached = 1.0;
  run.message.clear();
  run.load = "conform";
  run.shape = "disk";
  run.lateral = "";
  plystrain::LocalCheck check;
  check.defect_index = 2;
  check.applied_major = 0.03;
  check.applied_minor = -0.01;
  check.applied_at = {2500.0, 10.0};
  check.layers = {plystrain::test::cracked_absorber()};
  run.local = {check};
  plystrain::ConformResult conform;
  conform.surface = "sphere";
  conform.method = "wrap";
  conform.required_strain = {{"absorber", 0.021, {3000.0, 150.0}, -0.004}};
  conform.contact_fraction = 0.97;
  conform.max_penetration = 0.5;
  run.conform = conform;
  run.cautions.clear();

  const std::filesystem::path path = scratch.path() / "results.json";
  plystrain::write_results_json(path, run, {"um", 1.0});
  const json document = read_json(path);

  CHECK(document["model"]["lateral"].is_null());
  REQUIRE(document["local"].size() == 1);
  const json& local = document["local"][0];
  CHECK(local["defect"] == 2);
  CHECK(local["applied"] == json{{"major", 0.03}, {"minor", -0.01}, {"at", {2500.0, 10.0}}});
  REQUIRE(local["layers"].size() == 1);
  check_layer_types(local["layers"][0]);

  const json& block = document["conform"];
  CHECK(block["surface"] == "sphere");
  CHECK(block["method"] == "wrap");
  CHECK(block["required_strain"] ==
        json{{"absorber", {{"max", 0.021}, {"at", {3000.0, 150.0}}, {"min", -0.004}}}});
  CHECK(block["contact_fraction"] == 0.97);
  CHECK(block["max_penetration"] == 0.5);
  CHECK(document["cautions"].size() == plystrain::standard_cautions().size());
}

TEST_CASE("results.json writes an imposed lateral strain as a number and NaN as null",
          "[results_json]") {
  plystrain::RunResults run = plystrain::test::sample_run();
  run.lateral = "-0.015";
  run.layers[0].peak_strain = std::numeric_limits<double>::quiet_NaN();
  const json document = json::parse(plystrain::results_json_text(run, {"um", 1.0}));
  CHECK(document["model"]["lateral"].get<double>() == -0.015);
  CHECK(document["layers"][0]["peak_strain"].is_null());
}

TEST_CASE("results.json refuses a length scale that is not positive", "[results_json]") {
  const plystrain::RunResults run = plystrain::test::sample_run();
  CHECK_THROWS_AS(plystrain::results_json_text(run, {"um", 0.0}), std::invalid_argument);
}
