// The documented limits of a case (case_limits.hpp, docs/case-format-reference.md
// "Limits") against hostile input: floods, huge and deep text, control
// characters, lengths that change meaning when converted, and files that are
// not files. Each is refused with file:line, and its message stays short and
// free of control characters.
#include "case_test_support.hpp"

#include "plystrain/mesh/stack_mesher.hpp"
#include "plystrain/solver/case_limits.hpp"
#include "plystrain/solver/input_text.hpp"
#include "plystrain/solver/stack_from_case.hpp"

#include <sys/stat.h>

#include <cstdio>

#include <unistd.h>

using namespace plystrain;

namespace {

// The minimal case with `extra` appended (tables after [load]).
std::string with(const std::string& extra) {
  return test::minimal_case() + extra;
}

// Whether any line of `text` holds a control character.
bool shows_control_characters(const std::string& text) {
  std::size_t start = 0;
  while (start <= text.size()) {
    const std::size_t end = std::min(text.find('\n', start), text.size());
    if (has_control_characters(std::string_view(text).substr(start, end - start))) {
      return true;
    }
    start = end + 1;
  }
  return false;
}

std::string repeated(const std::string& piece, std::size_t count) {
  std::string text;
  for (std::size_t i = 0; i < count; ++i) {
    text += piece;
  }
  return text;
}

std::string number(double value) {
  char text[32];
  std::snprintf(text, sizeof text, "%.17g", value);
  return text;
}

std::string variants(std::size_t count) {
  std::string text;
  for (std::size_t i = 0; i < count; ++i) {
    text += "\n[[variant]]\nname = \"v" + std::to_string(i) + "\"\n";
  }
  return text;
}

std::string sweep_of(std::size_t count, const std::string& value) {
  std::string text = "\n[sweep]\nparameter = \"load.strain\"\nvalues = [";
  for (std::size_t i = 0; i < count; ++i) {
    text += (i > 0 ? ", " : "") + value;
  }
  return text + "]\n";
}

}  // namespace

TEST_CASE("a flood of variants is refused at the first past the limit", "[casefile][limits]") {
  const std::string text = with(variants(30000));
  REQUIRE(text.size() < limits::case_file_bytes);
  const InputError error = test::input_error_of_text(text, "flood.toml");
  REQUIRE(error.problems().size() == 1);
  CHECK(error.problems().front().key_path == "variant");
  // Line of the 101st [[variant]]: 22 lines of the case, then 3 per variant.
  CHECK(error.problems().front().where.line == 22 + 3 * 100 + 1);
  CHECK_THAT(error.what(),
             Catch::Matchers::Contains("at most 100 [[variant]] tables, found 30,000"));
  CHECK_NOTHROW(
      read_case_text(with(variants(limits::variants)), "enough.toml", test::test_library()));
}

TEST_CASE("a sweep of 100,000 values is refused without checking each", "[casefile][limits]") {
  const InputError error = test::input_error_of_text(with(sweep_of(100000, "0.1")), "sweep.toml");
  REQUIRE(error.problems().size() == 1);
  CHECK(error.problems().front().key_path == "sweep.values");
  CHECK(error.problems().front().where.line == 25);
  CHECK_THAT(error.what(), Catch::Matchers::Contains("at most 1,000 values, found 100,000"));
}

TEST_CASE("a thousand wrong values give five errors and a count", "[casefile][limits]") {
  const InputError error =
      test::input_error_of_text(with(sweep_of(limits::sweep_values, "\"x\"")), "wrong.toml");
  const std::string message = error.what();
  INFO(message);
  REQUIRE(error.problems().size() == problems_listed_per_kind);
  CHECK(error.problems().back().similar_not_listed == 995);
  CHECK_THAT(message, Catch::Matchers::Contains("... and 995 more errors like this"));
  CHECK(message.size() < 1500);
  CHECK_THAT(message, Catch::Matchers::StartsWith("wrong.toml:25:"));
}

TEST_CASE("many problems of different kinds list twenty and count the rest", "[casefile][limits]") {
  std::string text = test::minimal_case();
  for (int i = 0; i < 30; ++i) {
    text.insert(text.find("[geometry]"),
                "unknown_" + std::string(1, static_cast<char>('a' + i % 26)) +
                    std::string(static_cast<std::size_t>(i / 26 + 1), 'q') + " = 1\n");
  }
  const InputError error = test::input_error_of_text(text, "kinds.toml");
  INFO(error.what());
  CHECK(error.problems().size() == problems_listed_in_all);
  CHECK(error.not_listed() == 10);
  CHECK_THAT(error.what(), Catch::Matchers::EndsWith("kinds.toml: ... and 10 more errors"));
}

TEST_CASE("a huge key is echoed once, shortened", "[casefile][limits]") {
  const std::string key(500000, 'k');
  const InputError error =
      test::input_error_of_text(with("\n[mesh]\n" + key + " = 1\n"), "key.toml");
  const std::string message = error.what();
  CHECK(message.size() < 600);
  CHECK_THAT(message, Catch::Matchers::StartsWith("key.toml:24:1: mesh."));
  CHECK_THAT(message, Catch::Matchers::Contains("(500,000 characters)"));
}

TEST_CASE("a file past 1 MiB is refused where the limit is passed", "[casefile][limits]") {
  const std::string text =
      with("\ntitle_padding = \"" + std::string(limits::case_file_bytes, 'x') + "\"\n");
  const InputError error = test::input_error_of_text(text, "big.toml");
  REQUIRE(error.problems().size() == 1);
  CHECK(error.problems().front().where.line == 23);
  CHECK_THAT(error.what(), Catch::Matchers::Contains("at most 1,048,576 bytes"));
}

TEST_CASE("nesting is limited before the TOML parser sees it", "[casefile][limits]") {
  const auto deep_key = [](std::size_t parts) {
    std::string key = "a";
    for (std::size_t i = 1; i < parts; ++i) {
      key += ".a";
    }
    return key;
  };
  for (const std::string& deep :
       {deep_key(50000) + " = 1", "[" + deep_key(17) + "]",
        "x = " + std::string(17, '[') + std::string(17, ']'), "x = " + repeated("{a=", 1000)}) {
    const InputError error = test::input_error_of_text(with("\n" + deep + "\n"), "deep.toml");
    INFO(deep.substr(0, 40));
    REQUIRE(error.problems().size() == 1);
    CHECK(error.problems().front().where.line == 23);
    CHECK_THAT(error.what(), Catch::Matchers::Contains("nested at most 16 levels deep"));
  }
  // The deepest the format needs: a variant's set as nested tables, strings
  // and comments with brackets, and a profile's points, read as before.
  const std::string nested = with(
      "\n[[variant]]  # [[[[[[[[[[[[[[[[[[\nname = \"v\"\n"
      "set = { layer = { film = { thickness = 0.2 } }, title = "
      "\"[[[[{{{{.a.a.a.a.a.a.a.a.a.a.a.a.a.a.a.a.a\" }\n");
  const CaseSpec spec = read_case_text(nested, "nested.toml", test::test_library());
  REQUIRE(spec.variants.size() == 1);
  CHECK(spec.variants.front().set.size() == 2);
}

TEST_CASE("names and strings have lengths and no control characters", "[casefile][limits]") {
  std::string text = test::minimal_case();
  text.replace(text.find("\"film\""), 6, "\"" + std::string(limits::name_characters, 'f') + "\"");
  CHECK_NOTHROW(read_case_text(text, "name.toml", test::test_library()));
  text.replace(text.find("\"fff"), limits::name_characters + 2, "\"" + std::string(65, 'f') + "\"");
  CHECK_THAT(test::input_error_of_text(text).what(),
             Catch::Matchers::Contains("at most 64 characters"));

  for (const char* title : {"\"bell\\u0007\"", "\"\\u001b[2J\"", "\"nul\\u0000cut\"",
                            "\"\\u202Ereversed\"", "\"\\u0085\""}) {
    const InputError error = test::input_error_of_text(
        with("").replace(0, 10, std::string("format = 1\ntitle = ") + title + "\n"));
    const std::string message = error.what();
    INFO(message);
    CHECK(error.problems().front().key_path == "title");
    CHECK_THAT(message, Catch::Matchers::Contains("without control characters"));
    CHECK_FALSE(shows_control_characters(message));
    CHECK_THAT(message, Catch::Matchers::Contains("\\u"));  // the character is named, not dropped
  }
  const InputError key = test::input_error_of_text(with("\n[mesh]\n\"a\\u0000b\\u001bc\" = 1\n"));
  CHECK_THAT(key.what(), Catch::Matchers::Contains("a\\u0000b\\u001Bc"));
  CHECK_FALSE(shows_control_characters(key.what()));
}

TEST_CASE("lengths are checked after conversion to micrometres", "[casefile][limits]") {
  // The minimal case in `units`, its width as given.
  const auto read = [](const std::string& units, const std::string& width) {
    const double per_um = units == "m" ? 1e-6 : units == "mm" ? 1e-3 : units == "nm" ? 1e3 : 1.0;
    std::string text = test::minimal_case();
    text.replace(text.find("width = 100.0"), 13, "width = " + width);
    text.replace(text.find("thickness = 50.0"), 16, "thickness = " + number(50.0 * per_um));
    text.replace(text.find("thickness = 0.1"), 15, "thickness = " + number(0.1 * per_um));
    text.insert(text.find("\n") + 1, "units = \"" + units + "\"\n");
    return text;
  };
  CHECK_NOTHROW(read_case_text(read("m", "0.01"), "ok.toml", test::test_library()));
  for (const auto& [units, width, fragment] :
       {std::tuple{"m", "1e308", "found 1e+308 m, which is inf um"},
        std::tuple{"m", "10.5", "at most 1e+07 um (10 m)"},
        std::tuple{"nm", "5e-324", "which is 0.0 um"},
        std::tuple{"um", "1e-320", "at least 1e-04 um (0.1 nm)"},
        std::tuple{"mm", "1e-8", "which is 1e-05 um"}}) {
    const InputError error = test::input_error_of_text(read(units, width), "units.toml");
    INFO(error.what());
    CHECK(error.problems().front().key_path == "geometry.width");
    CHECK(error.problems().front().where.line == 6);
    CHECK_THAT(error.problems().front().message, Catch::Matchers::Contains(fragment));
  }
  // A variant's value is converted and checked like the base case's.
  const InputError set = test::input_error_of_text(
      with("\n[[variant]]\nname = \"v\"\nset = { \"layer.film.thickness\" = 1e-9 }\n"));
  CHECK(set.problems().front().where.line == 25);
  CHECK_THAT(set.what(), Catch::Matchers::Contains("at least 1e-04 um"));
}

TEST_CASE("what the mesher would refuse, check refuses first", "[casefile][limits]") {
  // Two stepped thin spots of one layer at different depths: the mesher
  // cannot line up their step walls.
  const std::string spots = with(
      "\n[[defect]]\nkind = \"thin-spot\"\nlayer = \"base\"\nat = 10.0\nsize = 4.0\ndepth = 0.2\n"
      "\n[[defect]]\nkind = \"thin-spot\"\nlayer = \"base\"\nat = 30.0\nsize = 4.0\ndepth = 0.5\n");
  const InputError error = test::input_error_of_text(spots, "spots.toml");
  INFO(error.what());
  CHECK(error.problems().front().where.line == 30);
  CHECK(error.problems().front().key_path == "defect[2]");
  CHECK_THAT(error.what(), Catch::Matchers::Contains("share one depth"));
}

TEST_CASE("the default averaging radius stays within the smallest defect", "[casefile][limits]") {
  const CaseSpec spec =
      read_case_text(with("\n[[defect]]\nkind = \"slit\"\nlayer = \"film\"\nsize = 0.04\n"),
                     "small.toml", test::test_library());
  // Half the thinnest layer would be 0.05 um; half the slit is 0.02 um.
  CHECK(spec.report.averaging_radius.value == Approx(0.02));
  CHECK_FALSE(spec.report.averaging_radius.given);
}

TEST_CASE("a change a variant would lose is an error", "[casefile][limits]") {
  const InputError layer =
      test::input_error_of_text(with("\n[[variant]]\nname = \"bare\"\nremove = [\"film\"]\nset = { "
                                     "\"layer.film.thickness\" = 0.2 }\n"));
  CHECK(layer.problems().front().key_path == "variant.bare.set.layer.film.thickness");
  CHECK(layer.problems().front().where.line == 26);
  const InputError defect = test::input_error_of_text(with(
      "\n[[defect]]\nkind = \"slit\"\nlayer = \"film\"\nsize = 2.0\n"
      "\n[[variant]]\nname = \"bare\"\nremove = [\"film\"]\nset = { \"defect.1.size\" = 1.0 }\n"));
  CHECK(defect.problems().front().key_path == "variant.bare.set.defect.1.size");
  CHECK_THAT(defect.what(), Catch::Matchers::Contains("goes with a layer it removes"));
  const InputError empty =
      test::input_error_of_text(with("\n[[variant]]\nname = \"v\"\n[variant.set.layer.film]\n"));
  CHECK(empty.problems().front().key_path == "variant.v.set.layer.film");
  CHECK(empty.problems().front().where.line == 25);
}

TEST_CASE("a case file that is not a regular file is refused without blocking",
          "[casefile][limits]") {
  const std::filesystem::path folder =
      std::filesystem::temp_directory_path() / ("plystrain-fifo-" + std::to_string(::getpid()));
  std::filesystem::create_directories(folder);
  const std::filesystem::path fifo = folder / "case.toml";
  REQUIRE(::mkfifo(fifo.c_str(), 0600) == 0);
  // No writer ever opens the pipe: a reader that opened it plainly would wait forever.
  const InputError pipe = test::input_error_of(fifo);
  CHECK_THAT(pipe.what(), Catch::Matchers::Contains("named pipe (FIFO)"));
  CHECK_THAT(pipe.what(), Catch::Matchers::StartsWith(fifo.string()));
  std::filesystem::remove_all(folder);
  CHECK_THAT(test::input_error_of("/dev/null").what(),
             Catch::Matchers::Contains("character device"));
}

TEST_CASE("the mesh estimate bounds the mesher's count closely", "[casefile][limits]") {
  // The estimate refuses a case before meshing: it must not be below the
  // count the mesher makes, nor so far above it that it refuses a case the
  // mesher would build within the limit.
  const std::filesystem::path cases = test::source_dir() / "cases";
  for (const char* name : {"sensor-patch-scratch", "thin-spot-debond", "wrist-foil-bend",
                           "dome-cell", "mould-patch-press"}) {
    const CaseSpec spec = read_case(cases / name / "case.toml");
    const double cells =
        static_cast<double>(mesh::build_stack_mesh(stack_from_case(spec)).cell_count());
    const double estimate = estimated_mesh_cells(spec);
    INFO(name << ": " << cells << " cells, estimated " << estimate);
    CHECK(estimate >= cells);
    CHECK(estimate <= 1.25 * cells);
  }
}
