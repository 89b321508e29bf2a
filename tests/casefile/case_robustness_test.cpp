// Arbitrary bytes never crash the reader: it either reads a case or throws
// InputError. Random buffers (fixed seed) and random edits of a valid case.
#include "case_test_support.hpp"

#include <random>

using namespace plystrain;

namespace {

// Reads `text`; true when it was read, false on InputError. Any other
// exception fails the test through Catch.
bool reads(const std::string& text) {
  try {
    static_cast<void>(read_case_text(text, "fuzz.toml", test::test_library()));
    return true;
  } catch (const InputError& error) {
    CHECK_FALSE(std::string(error.what()).empty());
    CHECK(error.problems().front().where.file == "fuzz.toml");
    return false;
  }
}

}  // namespace

TEST_CASE("random bytes are refused with an input error", "[casefile][robustness]") {
  std::mt19937 generator(20261202);
  std::uniform_int_distribution<int> byte(0, 255);
  std::uniform_int_distribution<int> printable(0x20, 0x7E);
  std::uniform_int_distribution<std::size_t> length(0, 400);
  int refused = 0;
  for (int buffer = 0; buffer < 300; ++buffer) {
    std::string text(length(generator), '\0');
    const bool ascii = buffer % 2 == 1;  // half of them pass the text check and reach the parser
    for (char& c : text) {
      c = static_cast<char>(ascii ? (printable(generator) == 0x7E ? '\n' : printable(generator))
                                  : byte(generator));
    }
    refused += reads(text) ? 0 : 1;
  }
  CHECK(refused == 300);
}

TEST_CASE("random edits of a valid case read or are refused cleanly", "[casefile][robustness]") {
  const std::string valid = test::read_text(test::case_data("good") / "every-key-stretch.toml");
  REQUIRE(reads(valid));
  std::mt19937 generator(7);
  std::uniform_int_distribution<std::size_t> position(0, valid.size() - 1);
  const std::string pieces[] = {"=", "[", "]", "\"", "0", "-1", "1e400", "nan", ".", "\n", "#",
                                "[[layer]]", "{", "}", ",", "\xC3", "inf", "99999999999999999999"};
  std::uniform_int_distribution<std::size_t> piece(0, std::size(pieces) - 1);
  std::uniform_int_distribution<int> action(0, 2);
  int read_count = 0;
  for (int trial = 0; trial < 300; ++trial) {
    std::string text = valid;
    for (int edit = 0; edit < 3; ++edit) {
      const std::size_t at = position(generator) % text.size();
      switch (action(generator)) {
        case 0: text.erase(at, 1 + at % 5); break;
        case 1: text.insert(at, pieces[piece(generator)]); break;
        default: text[at] = pieces[piece(generator)].front(); break;
      }
    }
    read_count += reads(text) ? 1 : 0;
  }
  // Some edits land in comments or strings and leave a valid case.
  CHECK(read_count < 300);
}
