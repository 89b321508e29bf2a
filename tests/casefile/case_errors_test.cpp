// Every malformed case in tests/data/cases/bad/ must be refused with an
// InputError whose first problem names the file, the line marked
// "# expect: <key path> | <message fragment>" in that file, the key path and
// the reason.
#include "case_test_support.hpp"

#include <algorithm>
#include <vector>

using plystrain::InputError;
using plystrain::InputProblem;
namespace test = plystrain::test;

namespace {

struct Expectation {
  int line = 0;  // 0: the whole file
  std::string key_path;
  std::string fragment;
};

Expectation expectation_of(const std::filesystem::path& file) {
  const std::string text = test::read_text(file);
  Expectation expected;
  const std::size_t marker = text.find("# expect:");
  if (marker == std::string::npos) {
    return expected;
  }
  expected.line = 1 + static_cast<int>(std::count(text.begin(), text.begin() + static_cast<long>(marker), '\n'));
  const std::size_t end = text.find_first_of("\n", marker);
  const std::string body = text.substr(marker + 9, end == std::string::npos ? std::string::npos : end - marker - 9);
  const std::size_t bar = body.find('|');
  const auto trim = [](std::string part) {
    const std::size_t first = part.find_first_not_of(' ');
    const std::size_t last = part.find_last_not_of(std::string(" \r\xff\xfe\0", 5));
    return first == std::string::npos ? std::string{} : part.substr(first, last - first + 1);
  };
  expected.key_path = trim(body.substr(0, bar));
  expected.fragment = trim(body.substr(bar + 1));
  return expected;
}

std::vector<std::filesystem::path> bad_cases() {
  std::vector<std::filesystem::path> files;
  for (const auto& entry : std::filesystem::directory_iterator(test::case_data("bad"))) {
    files.push_back(entry.path());
  }
  std::sort(files.begin(), files.end());
  return files;
}

}  // namespace

TEST_CASE("there are at least 15 malformed example cases", "[casefile][errors]") {
  CHECK(bad_cases().size() >= 15);
}

TEST_CASE("each malformed case names file, line, key and reason", "[casefile][errors]") {
  for (const std::filesystem::path& file : bad_cases()) {
    const std::string name = file.filename().string();
    if (name == "empty.toml") {
      continue;  // no line to mark; checked below
    }
    SECTION(name) {
      const Expectation expected = expectation_of(file);
      REQUIRE(expected.line > 0);
      const InputError error = test::input_error_of(file);
      REQUIRE_FALSE(error.problems().empty());
      const InputProblem& first = error.problems().front();
      INFO("message: " << error.what());
      CHECK(first.where.file == file.string());
      CHECK(first.where.line == expected.line);
      CHECK(first.key_path == expected.key_path);
      CHECK_THAT(first.message, Catch::Matchers::Contains(expected.fragment));
      // The text the user sees starts with file:line.
      CHECK_THAT(std::string(error.what()),
                 Catch::Matchers::StartsWith(file.string() + ":" + std::to_string(expected.line)));
    }
  }
}

TEST_CASE("an empty case file is refused", "[casefile][errors]") {
  const InputError error = test::input_error_of(test::case_data("bad") / "empty.toml");
  CHECK_THAT(std::string(error.what()), Catch::Matchers::Contains("empty.toml"));
  CHECK_THAT(std::string(error.what()), Catch::Matchers::Contains("is empty"));
  const InputError blank = test::input_error_of_text("\n  \n\t\n", "blank.toml");
  CHECK_THAT(std::string(blank.what()), Catch::Matchers::Contains("is empty"));
}

TEST_CASE("a missing case file is an input error naming it", "[casefile][errors]") {
  const InputError error = test::input_error_of(test::case_data("bad") / "no-such-case.toml");
  CHECK_THAT(std::string(error.what()), Catch::Matchers::Contains("no-such-case.toml"));
  const InputError directory = test::input_error_of(test::case_data("bad"));
  CHECK_THAT(std::string(directory.what()), Catch::Matchers::Contains("directory"));
}

TEST_CASE("several problems in one file are all reported", "[casefile][errors]") {
  std::string text = test::minimal_case();
  text.replace(text.find("thickness = 50.0"), 16, "thickness = -50.0");
  text.replace(text.find("material = \"p3ht\""), 17, "material = 12");
  text += "colour = \"red\"\n";
  const InputError error = test::input_error_of_text(text);
  REQUIRE(error.problems().size() == 3);
  CHECK(error.problems()[0].key_path == "layer.base.thickness");
  CHECK(error.problems()[0].where.line == 11);
  CHECK(error.problems()[1].key_path == "layer.film.material");
  CHECK(error.problems()[1].where.line == 16);
  CHECK(error.problems()[2].key_path == "load.colour");
  CHECK(error.problems()[2].where.line == 22);
}
