// Variant and sweep resolution, and the write/read round trip.
#include "case_test_support.hpp"

#include "plystrain/solver/case_variants.hpp"
#include "plystrain/solver/case_writer.hpp"

using namespace plystrain;

namespace {

CaseSpec good_case(const std::string& name) {
  return read_case(test::case_data("good") / name, test::test_library());
}

const ResolvedCase& named(const std::vector<ResolvedCase>& cases, const std::string& name) {
  for (const ResolvedCase& resolved : cases) {
    if (resolved.name == name) {
      return resolved;
    }
  }
  FAIL("no resolved case " << name);
  throw std::logic_error("unreachable");
}

// Writes `spec` and reads the text back as the same file.
CaseSpec round_trip(const CaseSpec& spec) {
  return read_case_text(write_case_toml(spec), spec.source, test::test_library());
}

}  // namespace

TEST_CASE("a variant that removes layers drops their defects", "[casefile][variants]") {
  const CaseSpec base = good_case("every-key-stretch.toml");
  const std::vector<ResolvedCase> variants = resolve_variants(base);
  REQUIRE(variants.size() == 2);
  const ResolvedCase& bare = named(variants, "bare");
  CHECK(bare.description == "remove cap, glue");
  REQUIRE(bare.spec.layers.size() == 3);
  CHECK(bare.spec.layers.back().name.value == "film");
  CHECK(bare.spec.find_layer("cap") == nullptr);
  CHECK(bare.spec.defects.size() == 3);  // none of the defects was in a removed layer
  CHECK(bare.spec.variants.empty());
  CHECK_FALSE(bare.spec.sweep.has_value());
  CHECK(bare.spec.report.out.value == base.report.out.value / "bare");

  // Removing the layer that holds a defect removes the defect too.
  std::string text = test::minimal_case();
  text +=
      "\n[[defect]]\nkind = \"slit\"\nlayer = \"film\"\nsize = 2\n"
      "\n[[defect]]\nkind = \"delamination\"\nbelow = \"base\"\nsize = 8\n"
      "\n[[variant]]\nname = \"no-film\"\nremove = [\"film\"]\n";
  const CaseSpec with_defects = read_case_text(text, "remove.toml", test::test_library());
  const ResolvedCase no_film = resolve_variants(with_defects).front();
  CHECK(no_film.spec.layers.size() == 1);
  CHECK(no_film.spec.defects.empty());  // the delamination was under the (removed) top interface
}

TEST_CASE("removing the encapsulant leaves a pinhole empty", "[casefile][variants]") {
  std::string text = test::minimal_case();
  text += "\n[[layer]]\nname = \"cap\"\nrole = \"encapsulant\"\nmaterial = \"parylene-c\"\n"
          "thickness = 2\n";
  text.insert(text.find("[load]"), "[[defect]]\nkind = \"slit\"\nlayer = \"film\"\nsize = 2\n\n");
  text += "\n[[variant]]\nname = \"bare\"\nremove = [\"cap\"]\n";
  // Keep [[layer]] tables before [load] is not required by TOML: the reader sees tables.
  const CaseSpec base = read_case_text(text, "bare.toml", test::test_library());
  CHECK(base.defects[0].fill.value == DefectFill::above);
  const ResolvedCase bare = resolve_variants(base).front();
  CHECK(bare.spec.defects[0].fill.value == DefectFill::empty);
}

TEST_CASE("set changes keys by dotted path, in the case's unit", "[casefile][variants]") {
  const CaseSpec base = good_case("every-key-stretch.toml");
  const std::vector<ResolvedCase> variants = resolve_variants(base);
  const ResolvedCase& thick = named(variants, "thick-film");
  const CaseSpec& spec = thick.spec;
  CHECK(spec.layers[2].thickness.value == Approx(0.2).epsilon(1e-12));  // 200 nm
  CHECK(spec.layers[2].thickness.given);
  CHECK(spec.defects[0].size.value == Approx(4.0).epsilon(1e-12));
  CHECK(spec.load.strain.value == 0.3);
  CHECK(spec.mesh.order.value == 2);
  CHECK(spec.report.fields.value);
  CHECK(spec.geometry.width.value == Approx(150.0).epsilon(1e-12));
  CHECK(spec.title.value == "thicker film");
  // Derived defaults follow the change: size_far = width / 40 was given in the base.
  CHECK(spec.mesh.size_far.value == base.mesh.size_far.value);
  // Values the variant did not touch stay.
  CHECK(spec.layers[0].thickness.value == base.layers[0].thickness.value);
  // Each change keeps the line of its `set`.
  CHECK(spec.load.strain.where.line == base.variants[1].set.front().where.line);
}

TEST_CASE("derived defaults are recomputed for a variant", "[casefile][variants]") {
  std::string text = test::minimal_case();
  text += "\n[[variant]]\nname = \"thinner\"\nset = { layer.film.thickness = 0.04, "
          "geometry.width = 80 }\n";
  const CaseSpec base = read_case_text(text, "derived.toml", test::test_library());
  CHECK(base.mesh.size_near.value == Approx(0.05));
  const CaseSpec spec = resolve_variants(base).front().spec;  // a copy: the vector is a temporary
  CHECK(spec.mesh.size_near.value == Approx(0.02));          // thinnest / 2
  CHECK(spec.report.averaging_radius.value == Approx(0.02));  // thinnest / 2
  CHECK(spec.mesh.size_far.value == Approx(2.0));             // width / 40
  CHECK(spec.mesh.grade_over.value == Approx(20.0));          // 10 * size_far
}

TEST_CASE("a variant that changes the load kind drops keys that no longer apply",
          "[casefile][variants]") {
  std::string text = test::minimal_case();
  text += "\n[[variant]]\nname = \"bent\"\nset = { \"load.kind\" = \"bend\", \"load.radius\" = "
          "[2000, -2000] }\n";
  const CaseSpec base = read_case_text(text, "kind.toml", test::test_library());
  const CaseSpec spec = resolve_variants(base).front().spec;  // a copy: the vector is a temporary
  CHECK(spec.load.kind.value == LoadKind::bend);
  CHECK(spec.load.radius.value == std::vector<double>{2000.0, -2000.0});
  CHECK_FALSE(spec.load.strain.given);
  CHECK(spec.load.lateral.value.mode == LateralMode::held);

  // Without the radius the bent variant is incomplete: the error names the variant.
  std::string incomplete = test::minimal_case();
  incomplete += "\n[[variant]]\nname = \"bent\"\nset = { \"load.kind\" = \"bend\" }\n";
  const InputError error = test::input_error_of_text(incomplete, "kind.toml");
  CHECK(error.problems().front().key_path == "load.radius");
  CHECK_THAT(error.problems().front().message, Catch::Matchers::Contains("variant \"bent\""));
}

TEST_CASE("set values are checked against the key table", "[casefile][variants]") {
  const auto refused = [](const std::string& change, const std::string& fragment) {
    std::string text = test::minimal_case();
    text += "\n[[variant]]\nname = \"v\"\nset = { " + change + " }\n";
    const InputError error = test::input_error_of_text(text, "set.toml");
    INFO(error.what());
    CHECK(error.problems().front().where.line == 25);
    CHECK_THAT(error.problems().front().message, Catch::Matchers::Contains(fragment));
  };
  refused("\"mesh.order\" = 3", "expected integer >= 1, <= 2, found 3");
  refused("\"mesh.order\" = 1.5", "expected an integer");
  refused("\"layer.film.role\" = \"absorber\"", "expected \"substrate\"");
  refused("\"layer.filn.thickness\" = 1", "did you mean \"film\"");
  refused("\"defect.1.size\" = 1", "expected a defect index from 1 to 0");
  refused("\"units\" = \"nm\"", "cannot be changed");
  refused("\"layer.film.name\" = \"x\"", "cannot be changed");
  refused("\"colour\" = 1", "unknown key");
  refused("\"load.kind\" = \"twist\"", "expected \"stretch\", \"bend\" or \"conform\"");
}

TEST_CASE("a sweep from, to, count gives linearly spaced runs", "[casefile][sweep]") {
  const CaseSpec base = good_case("every-key-stretch.toml");
  const std::vector<ResolvedCase> runs = resolve_sweep(base);
  REQUIRE(runs.size() == 3);
  const double expected[] = {0.05, 0.1, 0.15};  // 50, 100, 150 nm in micrometres
  for (std::size_t i = 0; i < runs.size(); ++i) {
    CHECK(runs[i].name == "sweep-" + std::to_string(i + 1));
    CHECK(runs[i].spec.layers[2].thickness.value == Approx(expected[i]).epsilon(1e-12));
    CHECK(runs[i].spec.report.out.value == base.report.out.value / runs[i].name);
    CHECK(runs[i].spec.variants.empty());
  }
  CHECK(runs[1].description == "layer.film.thickness = 100.0");
}

TEST_CASE("a sweep of values may hold arrays", "[casefile][sweep]") {
  const CaseSpec base = good_case("every-key-bend.toml");
  const std::vector<ResolvedCase> runs = resolve_sweep(base);
  REQUIRE(runs.size() == 2);
  CHECK(runs[0].spec.load.radius.value == std::vector<double>{2500.0});
  CHECK(runs[1].spec.load.radius.value.size() == 2);
  CHECK(runs[1].spec.load.radius.value[1] == Approx(-10000.0));
  CHECK(resolve_sweep(resolve_sweep(base).front().spec).empty());
}

TEST_CASE("sweep errors", "[casefile][sweep]") {
  const auto refused = [](const std::string& sweep, const std::string& key,
                          const std::string& fragment) {
    const std::string text = std::string(test::minimal_case()) + "\n[sweep]\n" + sweep;
    const InputError error = test::input_error_of_text(text, "sweep.toml");
    INFO(error.what());
    CHECK(error.problems().front().key_path == key);
    CHECK(error.problems().front().where.line >= 23);
    CHECK_THAT(error.problems().front().message, Catch::Matchers::Contains(fragment));
  };
  refused("parameter = \"mesh.order\"\nfrom = 1\nto = 2\ncount = 2\n", "sweep.parameter",
          "use `values`");
  refused("parameter = \"load.strain\"\nfrom = 0.1\nto = 0.2\n", "sweep.count", "missing");
  refused("parameter = \"load.strain\"\nvalues = [0.1]\nfrom = 0.1\n", "sweep.values", "both");
  refused("parameter = \"load.strian\"\nvalues = [0.1]\n", "sweep.parameter", "did you mean");
  refused("parameter = \"load.strain\"\nfrom = 0.1\nto = -1.5\ncount = 3\n", "sweep",
          "expected fraction > -1");
  refused("values = [0.1]\n", "sweep.parameter", "missing");
  refused("parameter = \"load.strain\"\nvalues = [0.1]\nstep = 2\n", "sweep.step", "unknown key");
}

TEST_CASE("write_case_toml reads back as the same case", "[casefile][roundtrip]") {
  for (const char* name : {"every-key-stretch.toml", "every-key-bend.toml", "every-key-press.toml",
                           "every-key-ellipsoid.toml", "every-key-profile.toml"}) {
    INFO(name);
    const CaseSpec spec = good_case(name);
    const CaseSpec again = round_trip(spec);
    CHECK(again == spec);
    // Writing is stable: the second text is the first.
    CHECK(write_case_toml(again) == write_case_toml(spec));
  }
  const CaseSpec minimal =
      read_case_text(test::minimal_case(), "minimal.toml", test::test_library());
  const std::string text = write_case_toml(minimal);
  CHECK_THAT(text, Catch::Matchers::Contains("# size_near = 0.05  # default"));
  CHECK(round_trip(minimal) == minimal);
}

TEST_CASE("a resolved variant written out reads back as itself", "[casefile][roundtrip]") {
  const CaseSpec base = good_case("every-key-stretch.toml");
  for (const ResolvedCase& variant : resolve_variants(base)) {
    INFO(variant.name);
    CHECK(round_trip(variant.spec) == variant.spec);
  }
  for (const ResolvedCase& run : resolve_sweep(base)) {
    CHECK(round_trip(run.spec) == run.spec);
  }
}

TEST_CASE("case equality sees a changed value", "[casefile][roundtrip]") {
  const CaseSpec spec = good_case("every-key-press.toml");
  CaseSpec changed = spec;
  changed.load.travel.value *= 1.2;
  CHECK_FALSE(changed == spec);
  CHECK_FALSE(round_trip(changed) == spec);
}
