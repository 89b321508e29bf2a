// The load factor at which a layer first reaches its limits, interpolated
// between converged increments (results-format-notes.md).
#include "io_fixtures.hpp"

#include "plystrain/solver/limit_crossings.hpp"

#include <catch2/catch.hpp>

namespace {

plystrain::LayerResult film_at(double peak) {
  plystrain::LayerResult layer = plystrain::test::cracked_absorber();  // onset 0.2, yield 0.04
  layer.peak_strain = peak;
  layer.crack_onset_load_factor.reset();
  layer.yield_load_factor.reset();
  return layer;
}

}  // namespace

TEST_CASE("crossings are interpolated between the increments around the limit",
          "[limit_crossings]") {
  // Peaks 0.1 at 0.4 and 0.3 at 0.8: the straight line between them reaches
  // the onset 0.2 half way, at 0.6. The yield strain 0.04 lies below the
  // first increment: the line from the undeformed state (0, 0) to (0.4, 0.1)
  // reaches it at 0.4 * 0.04 / 0.1 = 0.16.
  plystrain::LimitCrossings crossings;
  crossings.add(0.4, {film_at(0.1)});
  crossings.add(0.8, {film_at(0.3)});
  crossings.add(1.0, {film_at(0.35)});
  std::vector<plystrain::LayerResult> layers = {film_at(0.35)};
  crossings.apply_to(layers);
  REQUIRE(layers[0].crack_onset_load_factor);
  REQUIRE(layers[0].yield_load_factor);
  CHECK(*layers[0].crack_onset_load_factor == Approx(0.6).epsilon(1e-12));
  CHECK(*layers[0].yield_load_factor == Approx(0.16).epsilon(1e-12));
}

TEST_CASE("a limit not reached has no crossing, and a peak exactly at onset has one",
          "[limit_crossings]") {
  // Cracks at or above the onset (judge), so a peak equal to 0.2 crosses at
  // its own increment.
  plystrain::LimitCrossings crossings;
  crossings.add(0.5, {film_at(0.03)});
  crossings.add(1.0, {film_at(0.2)});
  std::vector<plystrain::LayerResult> layers = {film_at(0.2)};
  crossings.apply_to(layers);
  REQUIRE(layers[0].crack_onset_load_factor);
  CHECK(*layers[0].crack_onset_load_factor == Approx(1.0).epsilon(1e-12));

  plystrain::LimitCrossings below;
  below.add(1.0, {film_at(0.03)});
  below.add(1.0, {film_at(0.03)});  // the final state seen again changes nothing
  std::vector<plystrain::LayerResult> intact = {film_at(0.03)};
  below.apply_to(intact);
  CHECK_FALSE(intact[0].crack_onset_load_factor);
  CHECK_FALSE(intact[0].yield_load_factor);
}

TEST_CASE("the first crossing is kept when the peak falls back and rises again",
          "[limit_crossings]") {
  // Peaks 0 -> 0.25 over 0..0.5 reach 0.2 at 0.4; the later rise again past
  // the onset (after a dip) does not move it.
  plystrain::LimitCrossings crossings;
  crossings.add(0.5, {film_at(0.25)});
  crossings.add(0.7, {film_at(0.1)});
  crossings.add(0.9, {film_at(0.3)});
  std::vector<plystrain::LayerResult> layers = {film_at(0.3)};
  crossings.apply_to(layers);
  REQUIRE(layers[0].crack_onset_load_factor);
  CHECK(*layers[0].crack_onset_load_factor == Approx(0.4).epsilon(1e-12));
}
