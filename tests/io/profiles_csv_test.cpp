// profiles.csv read back: the documented header, one row per sample, lengths
// in the case's unit and numbers that parse back to the same doubles.
#include "io_fixtures.hpp"
#include "text_support.hpp"

#include "plystrain/solver/results_writers.hpp"

#include <catch2/catch.hpp>

#include <charconv>
#include <fstream>

using plystrain::test::read_lines;
using plystrain::test::split;

namespace {

double parse(const std::string& text) {
  double value = 0.0;
  const auto [end, error] = std::from_chars(text.data(), text.data() + text.size(), value);
  REQUIRE(error == std::errc());
  REQUIRE(end == text.data() + text.size());
  return value;
}

}  // namespace

TEST_CASE("profiles.csv has the documented header and one row per sample", "[profiles]") {
  const plystrain::test::ScratchDirectory scratch("profiles");
  std::vector<plystrain::ProfileSample> samples;
  for (int i = 0; i < 5; ++i) {
    const double x = 250.0 * i + 1.0 / 3.0;
    samples.push_back(
        {"absorber", x, 150.06, 0.01 * i + 0.1, -0.004 * i, 1e-17 * i, 0.01 * i + 0.1});
  }
  const std::filesystem::path path = scratch.path() / "profiles.csv";
  plystrain::write_profiles_csv(path, samples, {"mm", 1000.0});
  const std::vector<std::string> lines = read_lines(path);
  REQUIRE(lines.size() == 6);
  CHECK(lines[0] == "layer,x,z,strain_along,strain_across,strain_third,max_principal");
  for (std::size_t i = 0; i < samples.size(); ++i) {
    const std::vector<std::string> fields = split(lines[i + 1]);
    REQUIRE(fields.size() == 7);
    const plystrain::ProfileSample& sample = samples[i];
    CHECK(fields[0] == "absorber");
    CHECK(parse(fields[1]) == sample.x / 1000.0);
    CHECK(parse(fields[2]) == sample.z / 1000.0);
    CHECK(parse(fields[3]) == sample.strain_along);
    CHECK(parse(fields[4]) == sample.strain_across);
    CHECK(parse(fields[5]) == sample.strain_third);
    CHECK(parse(fields[6]) == sample.max_principal);
  }
}

TEST_CASE("profiles.csv quotes a layer name holding a comma", "[profiles]") {
  const std::string text =
      plystrain::profiles_csv_text({{"top, outer", 1.0, 2.0, 0, 0, 0, 0}}, {"um", 1.0});
  CHECK(text.find("\n\"top, outer\",1,2,0,0,0,0\n") != std::string::npos);
  CHECK(plystrain::csv_field("say \"hi\"") == "\"say \"\"hi\"\"\"");
  CHECK(plystrain::csv_field("plain") == "plain");
}

TEST_CASE("an empty profile is just the header", "[profiles]") {
  CHECK(plystrain::profiles_csv_text({}, {"um", 1.0}) ==
        "layer,x,z,strain_along,strain_across,strain_third,max_principal\n");
}
