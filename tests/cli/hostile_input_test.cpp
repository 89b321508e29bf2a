// The command line against hostile input: each class of the reader's limits
// (crashes, meaningless values, floods, files that are not files, control
// characters) ends in exit code 2 with a short message naming file and line
// and holding no control character; and a run whose verdict rests on the
// averaging radius says so.
#include "cli/cli_support.hpp"
#include "cli/results_support.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

#include <sys/stat.h>

#include <filesystem>
#include <fstream>
#include <regex>

using plystrain::test::data_path;
using plystrain::test::read_text;
using plystrain::test::run_plystrain;

namespace {

// A control character, or a byte no UTF-8 text has, on any line.
bool has_raw_control(const std::string& text) {
  for (const char c : text) {
    const auto byte = static_cast<unsigned char>(c);
    if ((byte < 0x20 && c != '\n') || byte == 0x7F) {
      return true;
    }
  }
  return false;
}

// Exit code 2, a message starting with `file:line:column`, short and clean.
void check_refused(const plystrain::test::CommandResult& result, const std::string& file) {
  INFO(result.err.substr(0, 2000));
  CHECK(result.exit_code == 2);
  CHECK(std::regex_search(
      result.err, std::regex("^" + std::regex_replace(file, std::regex(R"([.+])"), R"(\$&)") +
                             R"(:[0-9]+:[0-9]+: )")));
  CHECK(result.err.size() < 3000);
  CHECK_FALSE(has_raw_control(result.err));
  CHECK_FALSE(has_raw_control(result.out));
}

std::filesystem::path scratch_file(const std::string& name, const std::string& text) {
  const std::filesystem::path dir =
      plystrain::test::fresh_output_dir("hostile-" + std::filesystem::path(name).stem().string());
  std::filesystem::create_directories(dir);
  std::ofstream(dir / name, std::ios::binary) << text;
  return dir / name;
}

std::string small_case() {
  return "format = 1\n[geometry]\nshape = \"strip\"\nwidth = 100.0\n\n[[layer]]\nname = \"base\"\n"
         "role = \"substrate\"\nmaterial = \"silicone-10to1\"\nthickness = 25.0\n\n[[layer]]\n"
         "name = \"film\"\nrole = \"active\"\nmaterial = \"p3ht\"\nthickness = 0.1\n\n[load]\n"
         "kind = \"stretch\"\nstrain = 0.1\n";
}

}  // namespace

TEST_CASE("hostile cases end in exit code 2 with file and line", "[cli][hostile]") {
  for (const char* name :
       {"cases/bad/long-layer-name.toml", "cases/bad/deep-table-header.toml",
        "cases/bad/deep-dotted-key.toml", "cases/fuzz-found/long-name-mutant.toml",
        "cases/fuzz-found/deep-key-mutant.toml", "cases/bad/film-below-smallest-length.toml",
        "cases/bad/denormal-thickness.toml", "cases/bad/film-too-thin-for-the-stack.toml",
        "cases/bad/mesh-too-large.toml", "cases/bad/infinite-after-units.toml",
        "cases/bad/zero-after-units.toml", "cases/bad/set-in-removed-layer.toml",
        "cases/bad/set-empty-table.toml", "cases/bad/averaging-radius-a-metre.toml",
        "cases/bad/control-characters-in-material.toml", "cases/bad/too-many-radii.toml"}) {
    const std::string file = data_path(name);
    SECTION(name) {
      check_refused(run_plystrain("check '" + file + "'"), file);
    }
  }
}

TEST_CASE("mesh and run refuse a film too thin to mesh before meshing", "[cli][hostile]") {
  const std::string file = data_path("cases/bad/film-below-smallest-length.toml");
  const std::filesystem::path out = plystrain::test::fresh_output_dir("hostile-thin");
  for (const char* command : {"mesh", "run"}) {
    const auto result =
        run_plystrain(std::string(command) + " '" + file + "' --out '" + out.string() + "'");
    check_refused(result, file);
    CHECK_THAT(result.err, Catch::Matchers::Contains("at least 1e-04 um"));
  }
  CHECK_FALSE(std::filesystem::exists(out / "mesh.msh"));
}

TEST_CASE("floods are refused with one short message", "[cli][hostile]") {
  std::string variants = small_case();
  for (int i = 0; i < 30000; ++i) {
    variants += "\n[[variant]]\nname = \"v" + std::to_string(i) + "\"\n";
  }
  std::string values = small_case() + "\n[sweep]\nparameter = \"load.strain\"\nvalues = [";
  std::string wrong = values;
  for (int i = 0; i < 100000; ++i) {
    values += (i > 0 ? ", " : "") + std::string("0.1");
  }
  for (int i = 0; i < 1000; ++i) {
    wrong += (i > 0 ? ", " : "") + std::string("\"x\"");
  }
  const std::string huge_key = small_case() + "\n" + std::string(10 * 1024 * 1024, 'k') + " = 1\n";
  for (const auto& [name, text, fragment] :
       {std::tuple{"variants.toml", variants, "at most 100 [[variant]] tables"},
        std::tuple{"values.toml", values + "]\n", "at most 1,000 values, found 100,000"},
        std::tuple{"wrong.toml", wrong + "]\n", "and 995 more errors like this"},
        std::tuple{"key.toml", huge_key, "at most 1,048,576 bytes"}}) {
    const std::filesystem::path file = scratch_file(name, text);
    SECTION(name) {
      const auto result = run_plystrain("check '" + file.string() + "'");
      check_refused(result, file.string());
      CHECK_THAT(result.err, Catch::Matchers::Contains(fragment));
      CHECK(std::count(result.err.begin(), result.err.end(), '\n') <= 7);
    }
  }
}

TEST_CASE("a named pipe or a device as the case is refused without blocking", "[cli][hostile]") {
  const std::filesystem::path dir = plystrain::test::fresh_output_dir("hostile-fifo");
  std::filesystem::create_directories(dir);
  const std::filesystem::path fifo = dir / "case.toml";
  REQUIRE(::mkfifo(fifo.c_str(), 0600) == 0);
  const auto pipe = run_plystrain("check '" + fifo.string() + "'");
  CHECK(pipe.exit_code == 2);
  CHECK_THAT(pipe.err, Catch::Matchers::Contains("found a named pipe (FIFO)"));
  const auto device = run_plystrain("run /dev/zero");
  CHECK(device.exit_code == 2);
  CHECK_THAT(device.err, Catch::Matchers::Contains("found a character device"));
  std::filesystem::remove_all(dir);
}

TEST_CASE("control characters in a name are shown escaped", "[cli][hostile]") {
  std::string text = small_case();
  text.replace(text.find("\"film\""), 6, "\"fi\\u001b[31mlm\\u0007\\u0000x\"");
  const std::filesystem::path file = scratch_file("control.toml", text);
  const auto result = run_plystrain("check '" + file.string() + "'");
  check_refused(result, file.string());
  CHECK_THAT(result.err, Catch::Matchers::Contains("\"fi\\u001B[31mlm\\u0007\\u0000x\""));
}

TEST_CASE("a verdict the averaging decides is flagged in the summary and results.json",
          "[cli][hostile]") {
  const std::filesystem::path out = plystrain::test::fresh_output_dir("averaging-decides");
  const auto result = run_plystrain("run '" + data_path("cli/slit-film-averaging.toml") +
                                    "' --out '" + out.string() + "'");
  REQUIRE(result.exit_code == 0);
  const nlohmann::json results = nlohmann::json::parse(read_text(out / "results.json"));
  const nlohmann::json& film = plystrain::test::layer_named(results, "film");
  // The film's crack onset is 2 % (check-materials.toml); at 0.5 % applied
  // strain the averaged peak stays below it and the raw corner peak does not.
  CHECK(film["verdict"] == "intact");
  CHECK(film["raw_peak_verdict"] == "cracks");
  CHECK(film["peak_strain"].get<double>() < 0.02);
  CHECK(film["raw_peak_strain"].get<double>() >= 0.02);
  CHECK(plystrain::test::has_caution(results, "layer film: the verdict rests on the averaging"));
  CHECK_THAT(read_text(out / "summary.txt"),
             Catch::Matchers::Contains("layer film: the verdict rests on the averaging"));
  // The substrate has no limit data: nothing to disagree about.
  CHECK(plystrain::test::layer_named(results, "base")["raw_peak_verdict"] == "unknown");
  std::filesystem::remove_all(out);
}
