// The convergence check reruns a case on a mesh with half the sizes (about
// four times the cells): a case that passes the mesh limit itself but whose
// rerun would not is refused before anything is solved, naming the key or
// the option that asked for the check.
#include "cli/cli_support.hpp"

#include <catch2/catch.hpp>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <string>

namespace {

namespace fs = std::filesystem;
using plystrain::test::data_path;
using plystrain::test::read_text;
using plystrain::test::run_plystrain;

}  // namespace

TEST_CASE("a convergence check whose rerun would pass the mesh limit is refused before solving",
          "[cli][limits]") {
  const fs::path scratch = plystrain::test::fresh_output_dir("verify-limits");
  fs::create_directories(scratch);
  // homogeneous-strip-free.toml (5 um, two cells through, size_far 2 um)
  // made 200 mm wide: 100,000 columns of 2 cells, 200,000 cells; halved,
  // 200,000 columns of 5 cells through the 5 um sheet, past 1,000,000.
  std::string text = read_text(data_path("cli/homogeneous-strip-free.toml"));
  text.replace(text.find("width = 20.0"), 12, "width = 200000.0");
  const fs::path wide = scratch / "wide.toml";
  std::ofstream(wide) << text;
  const fs::path out = scratch / "out";

  CHECK(run_plystrain("check '" + wide.string() + "'").exit_code == 0);
  const auto by_option = run_plystrain("run '" + wide.string() + "' --verify --out '" + out.string() + "'");
  INFO(by_option.err);
  CHECK(by_option.exit_code == 2);
  CHECK(by_option.err.rfind(wide.string() + ": --verify: the convergence check would rerun the case with its "
                                             "mesh halved",
                            0) == 0);
  CHECK(by_option.err.find("more than the limit of 1,000,000") != std::string::npos);
  CHECK_FALSE(fs::exists(out));

  const fs::path asked = scratch / "asked.toml";
  std::ofstream(asked) << text << "verify = true\n";
  const int verify_line = static_cast<int>(std::count(text.begin(), text.end(), '\n')) + 1;
  for (const std::string& command : {std::string("check"), "run --out '" + out.string() + "'"}) {
    const auto by_key = run_plystrain(command + " '" + asked.string() + "'");
    INFO(command << ": " << by_key.err);
    CHECK(by_key.exit_code == 2);
    CHECK(by_key.err.rfind(asked.string() + ":" + std::to_string(verify_line) + ":", 0) == 0);
    CHECK(by_key.err.find("report.verify: the convergence check would rerun") != std::string::npos);
  }
  CHECK_FALSE(fs::exists(out));

  // compare reruns every variant with the case's report.verify: a variant
  // that widens the narrow case past the limit is refused before solving.
  std::string narrow = read_text(data_path("cli/homogeneous-strip-free.toml"));
  const int narrow_verify_line = static_cast<int>(std::count(narrow.begin(), narrow.end(), '\n')) + 1;
  narrow += "verify = true\n\n[[variant]]\nname = \"wide\"\nset = { \"geometry.width\" = 200000.0 }\n";
  const fs::path with_variant = scratch / "variant.toml";
  std::ofstream(with_variant) << narrow;
  const auto compared = run_plystrain("compare '" + with_variant.string() + "' --out '" + out.string() + "'");
  INFO(compared.err);
  CHECK(compared.exit_code == 2);
  CHECK(compared.err.rfind(with_variant.string() + ":" + std::to_string(narrow_verify_line) + ":", 0) == 0);
  CHECK(compared.err.find("report.verify: the convergence check would rerun") != std::string::npos);
  CHECK_FALSE(fs::exists(out));
  fs::remove_all(scratch);
}
