// Text echoed from a user's file into a message: control characters named,
// long values shortened, repeated problems counted.
#include "plystrain/solver/input_text.hpp"
#include "plystrain/solver/input_error.hpp"
#include "plystrain/solver/text_distance.hpp"

#include <catch2/catch.hpp>

using namespace plystrain;

TEST_CASE("control characters are named, not echoed", "[input][text]") {
  CHECK(escape_control_characters("plain text, é, µm") == "plain text, é, µm");
  CHECK(escape_control_characters(std::string("a\0b", 3)) == "a\\u0000b");
  CHECK(escape_control_characters("\x1b[31mred\x07") == "\\u001B[31mred\\u0007");
  CHECK(escape_control_characters("\x7f") == "\\u007F");
  CHECK(escape_control_characters("\xc2\x85") == "\\u0085");  // C1 next line
  CHECK(escape_control_characters("\xe2\x80\xae"
                                  "abc") == "\\u202Eabc");  // right-to-left override
  CHECK(escape_control_characters("\xff"
                                  "x\xc3") == "\\xFFx\\xC3");  // not UTF-8
  CHECK(has_control_characters("tab\there"));
  CHECK_FALSE(has_control_characters("no tab here"));
}

TEST_CASE("long values are shortened on a character boundary", "[input][text]") {
  CHECK(echoed(std::string(80, 'a')) == std::string(80, 'a'));
  const std::string long_text(100000, 'a');
  CHECK(echoed(long_text) == std::string(60, 'a') + "\u2026 (100,000 characters)");
  // Two-byte characters: 60 of them are kept whole, never half of one.
  std::string accented;
  for (int i = 0; i < 100; ++i) {
    accented += "é";
  }
  const std::string shown = echoed(accented);
  CHECK(shown.substr(0, 120) == accented.substr(0, 120));
  CHECK_THAT(shown, Catch::Matchers::EndsWith("\u2026 (100 characters)"));
  CHECK(quoted_echo("say \"hi\"\\") == "\"say \\\"hi\\\"\\\\\"");
  CHECK(grouped_count(0) == "0");
  CHECK(grouped_count(999) == "999");
  CHECK(grouped_count(1000) == "1,000");
  CHECK(grouped_count(1234567) == "1,234,567");
}

TEST_CASE("an input error lists a few of each kind and counts the rest", "[input][errors]") {
  const auto problem = [](int line, std::string key, std::string message) {
    InputProblem made;
    made.where = SourceLocation{"f.toml", line, line == 2000 ? 1 : 3};
    made.key_path = std::move(key);
    made.message = std::move(message);
    return made;
  };
  std::vector<InputProblem> problems;
  for (int i = 1; i <= 1000; ++i) {
    problems.push_back(
        problem(i, "sweep.values[" + std::to_string(i) + "]",
                "expected a number, found the string \"x" + std::to_string(i) + "\""));
  }
  problems.push_back(problem(2000, "title", "expected a string without control characters"));
  const InputError error(problems);
  REQUIRE(error.problems().size() == problems_listed_per_kind + 1);
  CHECK(error.problems()[problems_listed_per_kind - 1].similar_not_listed == 995);
  CHECK(error.problems().back().key_path == "title");
  CHECK_THAT(error.what(),
             Catch::Matchers::Contains("f.toml:5:3: ... and 995 more errors like this"));
  CHECK(error.not_listed() == 0);
}

TEST_CASE("an input error escapes and shortens what a reader put in it", "[input][errors]") {
  const std::string key(5000, 'k');
  const InputError error(SourceLocation{"a\x1b.toml", 2, 1}, key, "found \x07 and " + key);
  const std::string message = error.what();
  CHECK(message.size() < 400);
  CHECK_THAT(message, Catch::Matchers::StartsWith("a\\u001B.toml:2:1: kkk"));
  CHECK_THAT(message, Catch::Matchers::Contains("found \\u0007 and"));
  CHECK_THAT(message, Catch::Matchers::Contains("(5,000 characters)"));
  CHECK_FALSE(has_control_characters(message));
}

TEST_CASE("a hint is found as before for a long misspelt word", "[input][text]") {
  CHECK(closest_match("thicknes", {"thickness", "material"}) == "thickness");
  CHECK(closest_match(std::string(100000, 't'), {"thickness", "material"}).empty());
}
