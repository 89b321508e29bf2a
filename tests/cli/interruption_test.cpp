// SIGINT and SIGTERM stop a run cleanly: exit 4, the converged increments
// kept, and results.json saying how far it got. A rerun into a folder that
// holds an older complete run leaves exactly one run there, however it ends.
#include "cli/child_process.hpp"
#include "cli/cli_support.hpp"

#include "plystrain/solver/run_pipeline.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

#include <csignal>
#include <filesystem>
#include <fstream>
#include <regex>
#include <set>
#include <string>
#include <vector>

namespace {

namespace fs = std::filesystem;
using plystrain::test::ChildRun;
using plystrain::test::read_text;

nlohmann::json results_in_file(const fs::path& file) {
  std::ifstream in(file);
  return nlohmann::json::parse(in);
}

nlohmann::json results_in(const fs::path& folder) { return results_in_file(folder / "results.json"); }

std::set<std::string> step_files_in(const fs::path& folder) {
  std::set<std::string> names;
  for (const fs::directory_entry& entry : fs::directory_iterator(folder / "fields")) {
    names.insert(entry.path().filename().string());
  }
  return names;
}

std::set<std::string> step_files_listed(const fs::path& folder) {
  const std::string pvd = read_text(folder / "fields.pvd");
  const std::regex step("fields/(step-[0-9]+\\.vtu)");
  std::set<std::string> names;
  for (std::sregex_iterator it(pvd.begin(), pvd.end(), step), end; it != end; ++it) {
    names.insert((*it)[1].str());
  }
  return names;
}

// The folder holds one run and nothing of another: the case beside the
// results is the one they were computed from, and the field files on disk
// are exactly those fields.pvd lists, one per converged increment.
void check_one_run(const fs::path& folder, const std::string& title) {
  const nlohmann::json results = results_in(folder);
  const std::string case_as_run = read_text(folder / "case.toml");
  CHECK(results["title"] == title);
  CHECK(case_as_run.find(title) != std::string::npos);
  CHECK(results["case_hash"] == plystrain::case_hash(case_as_run));
  CHECK(step_files_in(folder) == step_files_listed(folder));
  CHECK(static_cast<int>(step_files_in(folder).size()) == results["solver"]["increments"]);
}

// The hidden folders of runs beside the output folder.
int hidden_beside(const fs::path& folder) {
  const std::string prefix = "." + folder.filename().string() + ".";
  int count = 0;
  for (const fs::directory_entry& entry : fs::directory_iterator(folder.parent_path())) {
    count += entry.path().filename().string().rfind(prefix, 0) == 0 ? 1 : 0;
  }
  return count;
}

// Runs `case_file` into `out` and signals the run with `signal` once it has
// printed its first converged increment; returns the exit code.
int interrupted_run(const fs::path& case_file, const fs::path& out, int signal,
                    std::string& errors) {
  const fs::path error_file = out.parent_path() / (out.filename().string() + "-stderr.txt");
  int code = 0;
  {
    ChildRun child({"run", case_file.string(), "--out", out.string()}, error_file.string());
    REQUIRE(child.wait_for("increment 1:", std::chrono::seconds(120)));
    child.send(signal);
    code = child.finish();
  }
  errors = read_text(error_file);
  fs::remove(error_file);
  return code;
}

}  // namespace

TEST_CASE("an interrupted rerun over a complete run leaves one run: its own, partial",
          "[cli][interrupt]") {
  // A uniform strip: 40 nominal increments (about 45 with the first ones
  // ramped), each a fraction of a second; the test signals the run right
  // after its first, so it stops far from the full load.
  const fs::path scratch = plystrain::test::fresh_output_dir("interrupt");
  fs::create_directories(scratch);
  const std::string slow_text = read_text(plystrain::test::data_path("cli/interrupt-strip.toml"));
  std::string quick_text = slow_text;
  quick_text.replace(quick_text.find("steps = 40"), 10, "steps = 2");
  quick_text.replace(quick_text.find("to be interrupted"), 17, "run to the end");
  const std::string slow_title =
      "Homogeneous strip stretched in many increments, to be interrupted";
  const fs::path slow = scratch / "slow.toml";
  const fs::path quick = scratch / "quick.toml";
  std::ofstream(slow) << slow_text;
  std::ofstream(quick) << quick_text;
  const fs::path out = scratch / "out";

  // An older complete run, with more increments than the interrupted one
  // will have.
  const auto complete =
      plystrain::test::run_plystrain("run '" + quick.string() + "' --out '" + out.string() + "'");
  REQUIRE(complete.exit_code == 0);
  REQUIRE(results_in(out)["completed"] == true);
  const std::size_t complete_steps = step_files_in(out).size();
  REQUIRE(complete_steps >= 4);

  std::string errors;
  CHECK(interrupted_run(slow, out, SIGINT, errors) == 4);
  CHECK(errors.find("stopping after the current iteration") != std::string::npos);
  nlohmann::json results = results_in(out);
  CHECK(results["completed"] == false);
  CHECK(results["interrupted_by"] == "SIGINT");
  const std::string message = results["message"].get<std::string>();
  CHECK(message.rfind("interrupted by SIGINT: stopped at load factor", 0) == 0);
  const int increments = results["solver"]["increments"].get<int>();
  CHECK(increments >= 1);
  CHECK(static_cast<std::size_t>(increments) < complete_steps);
  CHECK(results["load_reached"].get<double>() > 0.0);
  CHECK(results["load_reached"].get<double>() < 0.5);
  CHECK(read_text(out / "summary.txt").find("interrupted by SIGINT") != std::string::npos);
  check_one_run(out, slow_title);
  CHECK(hidden_beside(out) == 0);

  // Killed outright, a run leaves the folder with the run it held, and its
  // own files in the hidden folder beside it.
  const std::string before = read_text(out / "results.json");
  {
    ChildRun child({"run", slow.string(), "--out", out.string()}, "/dev/null");
    REQUIRE(child.wait_for("increment 1:", std::chrono::seconds(120)));
    child.send(SIGKILL);
    CHECK(child.finish() == -1);
    const fs::path hidden = scratch / (".out.partial-" + std::to_string(child.pid()));
    CHECK(fs::exists(hidden / "case.toml"));
    fs::remove_all(hidden);
  }
  CHECK(read_text(out / "results.json") == before);
  check_one_run(out, slow_title);

  // SIGTERM, as a batch system sends it, stops the run the same way.
  CHECK(interrupted_run(slow, out, SIGTERM, errors) == 4);
  results = results_in(out);
  CHECK(results["completed"] == false);
  CHECK(results["interrupted_by"] == "SIGTERM");
  check_one_run(out, slow_title);
  CHECK(hidden_beside(out) == 0);
  fs::remove_all(scratch);
}

TEST_CASE("an interrupted comparison or sweep ends after the run it stopped, with the runs so far",
          "[cli][interrupt]") {
  const fs::path scratch = plystrain::test::fresh_output_dir("interrupt-studies");
  fs::create_directories(scratch);
  const std::string slow_text = read_text(plystrain::test::data_path("cli/interrupt-strip.toml"));
  struct Study {
    const char* command;
    const char* extra;
    const char* table;       // the combined table's JSON file
    const char* first_run;   // folder of the run the signal stops
    const char* second_run;  // folder of the run that must not start
  };
  const std::vector<Study> studies = {
      {"compare", "\n[[variant]]\nname = \"thicker\"\nset = { \"layer.sheet.thickness\" = 6.0 }\n",
       "comparison.json", "base", "thicker"},
      {"run", "\n[sweep]\nparameter = \"load.strain\"\nvalues = [0.1, 0.05]\n", "sweep.json", "sweep-1",
       "sweep-2"},
  };
  for (const Study& study : studies) {
    INFO(study.command);
    const fs::path case_file = scratch / (std::string(study.command) + ".toml");
    std::ofstream(case_file) << slow_text << study.extra;
    const fs::path out = scratch / (std::string(study.command) + "-out");
    int code = 0;
    {
      ChildRun child({study.command, case_file.string(), "--out", out.string()}, "/dev/null");
      REQUIRE(child.wait_for("increment 1:", std::chrono::seconds(120)));
      child.send(SIGINT);
      code = child.finish();
    }
    CHECK(code == 4);
    const nlohmann::json table = results_in_file(out / study.table);
    REQUIRE(table["runs"].size() == 1);
    CHECK(table["runs"][0]["completed"] == false);
    CHECK(table["runs"][0]["load_reached"].get<double>() < 0.5);
    CHECK(results_in(out / study.first_run)["interrupted_by"] == "SIGINT");
    CHECK_FALSE(fs::exists(out / study.second_run));
    CHECK(hidden_beside(out) == 0);
  }
  fs::remove_all(scratch);
}
