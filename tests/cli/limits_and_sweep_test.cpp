// The load factor at which a layer first reaches its limits, its yield
// margin and the headline, from a run whose strain is known in closed form;
// a [sweep] run end to end; compare refusing a swept case.
#include "cli/cli_support.hpp"
#include "text_support.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

#include <filesystem>
#include <fstream>
#include <regex>
#include <sstream>
#include <vector>

using plystrain::test::read_text;
using plystrain::test::run_plystrain;

using plystrain::test::lines_of;
using plystrain::test::split;

namespace {

// A film material with chosen limits: crack onset 7 %, yield 3 %. The law is
// irrelevant to the strains of these runs (the edge displacement fixes them).
constexpr double crack_onset = 0.07;
constexpr double yield_strain = 0.03;

const char* const materials_text = R"(
[limit-check-sheet]
model = "neo-hookean"
youngs_modulus = 3.0
poisson_ratio = 0.45
crack_onset_strain = 0.07
yield_strain = 0.03
basis = "demo"
method = "assumed"
source = "chosen for the limit-crossing check"
)";

// A defect-free strip of one material, stretched with the lateral direction
// free, `layers` layers of it (bonded: still one homogeneous body).
std::string strip_case(double strain, int layers, int steps, const std::string& extra) {
  std::ostringstream text;
  text << "format = 1\ntitle = \"Homogeneous strip with chosen limits\"\nunits = \"um\"\n"
       << "materials = [\"limits.toml\"]\n\n[geometry]\nshape = \"strip\"\nwidth = 20.0\n";
  for (int i = 0; i < layers; ++i) {
    text << "\n[[layer]]\nname = \"sheet-" << i + 1
         << "\"\nrole = \"substrate\"\nmaterial = \"limit-check-sheet\"\nthickness = 2.5\n";
  }
  text << "\n[load]\nkind = \"stretch\"\nstrain = " << strain
       << "\nlateral = \"free\"\nsteps = " << steps
       << "\n\n[mesh]\nsize_far = 2.0\nelements_through = 2\n\n[report]\n"
       << "averaging_radius = 0.5\nfields = false\nprofiles = false\n"
       << extra;
  return text.str();
}

std::filesystem::path write_case(const std::string& name, const std::string& case_text) {
  const std::filesystem::path dir = plystrain::test::fresh_output_dir(name + "-case");
  std::filesystem::create_directories(dir);
  std::ofstream(dir / "limits.toml") << materials_text;
  std::ofstream(dir / "case.toml") << case_text;
  return dir;
}

}  // namespace

TEST_CASE("the load factor of first crack and first yield of a homogeneous stretch",
          "[cli][limits]") {
  // The stretch moves the outer edge by f * strain * width at load factor f
  // (a linear ramp; the symmetry plane holds x = 0), so a defect-free strip
  // is homogeneous with nominal strain along x of f * strain; the lateral
  // and thickness stretches are below 1 (free contraction), so the largest
  // principal nominal strain, and its disc average, is f * strain
  // everywhere. It reaches the crack onset at f = onset / strain
  // = 0.07 / 0.1 = 0.7 and exceeds the yield strain from f = 0.03 / 0.1 = 0.3.
  // Both fall inside increments (steps = 4: 0.25, 0.5, 0.75, 1 when none is
  // cut back), and the peak being linear in f, the interpolation between
  // increments is exact. Fields are off: the increments are evaluated anyway.
  const double strain = 0.1;
  const std::filesystem::path dir = write_case("limits", strip_case(strain, 1, 4, ""));
  const std::filesystem::path out = dir / "out";
  const auto result =
      run_plystrain("run '" + (dir / "case.toml").string() + "' --out '" + out.string() + "'");
  INFO(result.out << "\n" << result.err);
  REQUIRE(result.exit_code == 0);
  CHECK_FALSE(std::filesystem::exists(out / "fields.pvd"));
  const nlohmann::json results = nlohmann::json::parse(read_text(out / "results.json"));
  REQUIRE(results["layers"].size() == 1);
  const nlohmann::json& sheet = results["layers"][0];
  const double peak = sheet["peak_strain"].get<double>();
  CHECK(peak == Approx(strain).epsilon(1e-6));
  const double crack_factor = sheet["crack_onset_load_factor"].get<double>();
  const double yield_factor = sheet["yield_load_factor"].get<double>();
  CHECK(crack_factor == Approx(crack_onset / strain).epsilon(1e-6));
  CHECK(yield_factor == Approx(yield_strain / strain).epsilon(1e-6));
  // yield_margin = 1 - peak / yield strain (results-format-notes.md).
  CHECK(sheet["yield_margin"].get<double>() == Approx(1.0 - peak / yield_strain).epsilon(1e-12));
  CHECK(sheet["crack_margin"].get<double>() == Approx(1.0 - peak / crack_onset).epsilon(1e-12));

  // The increment where the peak (f * strain) first reaches the onset, read
  // from the log: the factor lies between it and the increment before.
  const std::regex increment_line(R"(increment \d+: load factor ([0-9.]+))");
  double below = 0.0;
  double at_or_above = -1.0;
  for (const std::string& line : lines_of(read_text(out / "log.txt"))) {
    std::smatch match;
    if (std::regex_search(line, match, increment_line)) {
      const double factor = std::stod(match[1].str());
      if (factor * strain < crack_onset) {
        below = factor;
      } else if (at_or_above < 0.0) {
        at_or_above = factor;
      }
    }
  }
  REQUIRE(at_or_above > 0.0);
  CHECK(crack_factor > below);
  CHECK(crack_factor <= at_or_above);

  CHECK(results["verdict"] == "cracks");
  CHECK(results["headline"] == "1 of 1 layer cracks: sheet-1; load reached 100 %");
  // The terminal shows the headline and the first-crack share of the load (70).
  CHECK(result.out.find("1 of 1 layer cracks: sheet-1; load reached 100 %") != std::string::npos);
  std::filesystem::remove_all(dir);
}

TEST_CASE("a sweep runs every value into its own folder and writes a combined table",
          "[cli][sweep]") {
  // Three applied strains on a two-layer strip of one material: each run is
  // homogeneous (see the test above), so each layer's peak is the applied
  // strain and the first crack comes at onset / strain when strain >= onset.
  const std::vector<double> values = {0.05, 0.1, 0.125};
  const std::filesystem::path dir = write_case(
      "sweep", strip_case(0.05, 2, 2,
                          "\n[sweep]\nparameter = \"load.strain\"\nvalues = [0.05, 0.1, 0.125]\n"));
  const std::filesystem::path out = dir / "out";
  const auto result =
      run_plystrain("run '" + (dir / "case.toml").string() + "' --out '" + out.string() + "'");
  INFO(result.out << "\n" << result.err);
  REQUIRE(result.exit_code == 0);
  for (std::size_t i = 0; i < values.size(); ++i) {
    const std::string folder = "sweep-" + std::to_string(i + 1);
    INFO(folder);
    CHECK(std::filesystem::exists(out / folder / "results.json"));
    CHECK(std::filesystem::exists(out / folder / "summary.txt"));
    CHECK(result.out.find("sweep value " + std::to_string(i + 1) + " of 3: load.strain = ") !=
          std::string::npos);
  }
  for (const char* file : {"sweep.csv", "sweep.json", "sweep.txt"}) {
    CHECK(std::filesystem::exists(out / file));
  }

  const std::vector<std::string> csv = lines_of(read_text(out / "sweep.csv"));
  REQUIRE(csv.size() == 1 + values.size() * 2);
  CHECK(csv[0] ==
        "run,parameter,value,layer,peak_strain,concentration,crack_margin,yield_margin,verdict,"
        "crack_onset_load_factor,yield_load_factor,best,completed");
  for (std::size_t row = 1; row < csv.size(); ++row) {
    const std::vector<std::string> fields = split(csv[row]);
    REQUIRE(fields.size() == 13);
    const std::size_t value_index = (row - 1) / 2;
    const double strain = values[value_index];
    INFO(csv[row]);
    CHECK(fields[0] == "sweep-" + std::to_string(value_index + 1));
    CHECK(fields[1] == "load.strain");
    CHECK(std::stod(fields[2]) == strain);
    CHECK(fields[3] == "sheet-" + std::to_string((row - 1) % 2 + 1));
    CHECK(std::stod(fields[4]) == Approx(strain).epsilon(1e-6));
    CHECK(std::stod(fields[6]) == Approx(1.0 - strain / crack_onset).epsilon(1e-6));
    CHECK(std::stod(fields[7]) == Approx(1.0 - strain / yield_strain).epsilon(1e-6));
    CHECK(fields[8] == (strain >= crack_onset ? "cracks" : "yields"));
    if (strain >= crack_onset) {
      CHECK(std::stod(fields[9]) == Approx(crack_onset / strain).epsilon(1e-6));
    } else {
      CHECK(fields[9].empty());
    }
    // The widest margin is the smallest strain's.
    CHECK(fields[11] == (value_index == 0 ? "true" : "false"));
    CHECK(fields[12] == "true");
  }
  const nlohmann::json sweep = nlohmann::json::parse(read_text(out / "sweep.json"));
  CHECK(sweep["parameter"] == "load.strain");
  CHECK(sweep["runs"].size() == values.size());
  CHECK(sweep["rows"].size() == values.size() * 2);
  std::filesystem::remove_all(dir);
}

TEST_CASE("compare refuses a case with a sweep, naming the sweep's line", "[cli][sweep]") {
  const std::string text =
      strip_case(0.05, 1, 2,
                 "\n[[variant]]\nname = \"more\"\nset = { \"load.strain\" = 0.06 }\n\n[sweep]\n"
                 "parameter = \"load.strain\"\nvalues = [0.05, 0.1]\n");
  const std::filesystem::path dir = write_case("compare-sweep", text);
  int sweep_line = 0;
  const std::vector<std::string> lines = lines_of(text);
  for (std::size_t i = 0; i < lines.size(); ++i) {
    if (lines[i] == "[sweep]") {
      sweep_line = static_cast<int>(i) + 1;
    }
  }
  REQUIRE(sweep_line > 0);
  const auto result = run_plystrain("compare '" + (dir / "case.toml").string() + "' --out '" +
                                    (dir / "out").string() + "'");
  INFO(result.out << "\n" << result.err);
  CHECK(result.exit_code == 2);  // bad input (README, exit codes)
  CHECK(result.err.find("case.toml:" + std::to_string(sweep_line)) != std::string::npos);
  CHECK(result.err.find("plystrain run") != std::string::npos);
  CHECK_FALSE(std::filesystem::exists(dir / "out" / "base"));
  std::filesystem::remove_all(dir);
}
