// Verdict rules of results-format.md (the project's output contract): cracks
// at or above crack onset, yields above the yield strain and below crack
// onset, intact otherwise, unknown when the material has neither limit.
#include "io_fixtures.hpp"

#include "plystrain/solver/results.hpp"

#include <catch2/catch.hpp>

#include <cmath>
#include <limits>
#include <string>

using plystrain::judge;
using plystrain::Verdict;

TEST_CASE("verdict names are the documented strings", "[verdict]") {
  CHECK(std::string(plystrain::verdict_name(Verdict::intact)) == "intact");
  CHECK(std::string(plystrain::verdict_name(Verdict::yields)) == "yields");
  CHECK(std::string(plystrain::verdict_name(Verdict::cracks)) == "cracks");
  CHECK(std::string(plystrain::verdict_name(Verdict::unknown)) == "unknown");
}

TEST_CASE("a peak equal to crack onset cracks", "[verdict]") {
  CHECK(judge(0.02, 0.02, 0.01) == Verdict::cracks);
  CHECK(judge(0.02, 0.02, std::nullopt) == Verdict::cracks);
  CHECK(judge(std::nextafter(0.02, 0.0), 0.02, std::nullopt) == Verdict::intact);
}

TEST_CASE("above yield and below crack onset yields", "[verdict]") {
  CHECK(judge(0.015, 0.02, 0.01) == Verdict::yields);
  CHECK(judge(0.015, std::nullopt, 0.01) == Verdict::yields);
  // At the yield strain itself the layer has not gone above it.
  CHECK(judge(0.01, 0.02, 0.01) == Verdict::intact);
  CHECK(judge(0.005, 0.02, 0.01) == Verdict::intact);
}

TEST_CASE("no limits gives unknown, whatever the strain", "[verdict]") {
  CHECK(judge(0.0, std::nullopt, std::nullopt) == Verdict::unknown);
  CHECK(judge(5.0, std::nullopt, std::nullopt) == Verdict::unknown);
}

TEST_CASE("a peak that failed to evaluate is never intact", "[verdict]") {
  CHECK(judge(std::numeric_limits<double>::quiet_NaN(), 0.02, 0.01) == Verdict::unknown);
  CHECK(judge(std::numeric_limits<double>::infinity(), 0.02, 0.01) == Verdict::unknown);
}

TEST_CASE("worse orders cracks over yields over intact, unknown only alone", "[verdict]") {
  using plystrain::worse;
  CHECK(worse(Verdict::intact, Verdict::cracks) == Verdict::cracks);
  CHECK(worse(Verdict::cracks, Verdict::yields) == Verdict::cracks);
  CHECK(worse(Verdict::yields, Verdict::intact) == Verdict::yields);
  CHECK(worse(Verdict::unknown, Verdict::intact) == Verdict::intact);
  CHECK(worse(Verdict::yields, Verdict::unknown) == Verdict::yields);
  CHECK(worse(Verdict::unknown, Verdict::unknown) == Verdict::unknown);
}

TEST_CASE("governing layers take the worst of global and local checks", "[verdict]") {
  plystrain::RunResults run = plystrain::test::sample_run();
  plystrain::LayerResult intact_absorber = plystrain::test::cracked_absorber();
  intact_absorber.peak_strain = 0.1;
  intact_absorber.crack_margin = 0.5;
  intact_absorber.verdict = judge(0.1, 0.2, 0.04);
  REQUIRE(intact_absorber.verdict == Verdict::yields);
  run.layers = {plystrain::test::substrate_without_limits(), intact_absorber};

  plystrain::LocalCheck check;
  check.defect_index = 1;
  plystrain::LayerResult local_absorber = plystrain::test::cracked_absorber();
  local_absorber.peak_at = {10.0, 150.0};
  check.layers = {local_absorber};
  run.local = {check};

  const std::vector<plystrain::LayerResult> governing = plystrain::governing_layers(run);
  REQUIRE(governing.size() == 2);
  CHECK(governing[0].name == "substrate");
  CHECK(governing[0].verdict == Verdict::unknown);
  CHECK(governing[1].name == "absorber");
  CHECK(governing[1].verdict == Verdict::cracks);
  CHECK(governing[1].peak_strain == local_absorber.peak_strain);
  CHECK(governing[1].peak_at == local_absorber.peak_at);
  CHECK(governing[1].crack_margin == local_absorber.crack_margin);
  CHECK(governing[1].min_strain == -0.11);
}
