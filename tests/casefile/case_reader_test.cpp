// The reader accepts every key of the case format with its documented
// default (docs/case-format-reference.md, the contract in case-format.md),
// converts lengths to micrometres once and keeps each value's location.
#include "case_test_support.hpp"

#include "plystrain/solver/key_table.hpp"

#include <cmath>

using namespace plystrain;

namespace {

// Relative tolerance for lengths after a unit conversion (one rounding of a
// product of two doubles: a few ulp; common practice).
Approx length(double micrometres) { return Approx(micrometres).epsilon(1e-12); }

CaseSpec good_case(const std::string& name) {
  return read_case(test::case_data("good") / name, test::test_library());
}

}  // namespace

TEST_CASE("a minimal case gets every documented default", "[casefile][defaults]") {
  const std::filesystem::path file = test::case_data("good") / "minimal.toml";
  const CaseSpec spec = read_case_text(test::minimal_case(), file, test::test_library());

  CHECK(spec.format.value == 1);
  CHECK(spec.title.value == "minimal.toml");  // default: the file name
  CHECK_FALSE(spec.title.given);
  CHECK(spec.units.value == LengthUnit::um);
  CHECK_FALSE(spec.units.given);
  CHECK(spec.material_files.empty());
  CHECK(spec.geometry.shape.value == Shape::strip);
  CHECK(spec.geometry.width.value == 100.0);
  CHECK(spec.geometry.symmetric.value);
  CHECK_FALSE(spec.geometry.symmetric.given);

  REQUIRE(spec.layers.size() == 2);
  CHECK(spec.layers[0].name.value == "base");
  CHECK(spec.layers[0].role.value == LayerRole::substrate);
  CHECK(spec.layers[1].material.value == "p3ht");
  CHECK(spec.layers[1].thickness.value == 0.1);
  for (const LayerSpec& layer : spec.layers) {
    CHECK(layer.elements_through.value == 3);  // default: mesh.elements_through = 3
    CHECK_FALSE(layer.elements_through.given);
  }
  CHECK(spec.defects.empty());

  CHECK(spec.load.kind.value == LoadKind::stretch);
  CHECK(spec.load.strain.value == 0.1);
  CHECK(spec.load.lateral.value.mode == LateralMode::free);  // default for stretch
  CHECK_FALSE(spec.load.lateral.given);
  CHECK(spec.load.steps.value == 10);
  CHECK(spec.load.max_steps.value == 200);
  CHECK_FALSE(spec.load.local.value);  // no defects

  CHECK(spec.mesh.size_near.value == Approx(0.05));   // thinnest layer / 2
  CHECK(spec.mesh.size_far.value == Approx(2.5));     // width / 40
  CHECK(spec.mesh.grade_over.value == Approx(25.0));  // 10 * size_far
  CHECK(spec.mesh.elements_through.value == 3);
  CHECK(spec.mesh.order.value == 2);
  CHECK_FALSE(spec.mesh.size_near.given);

  CHECK(spec.report.out.value ==
        std::filesystem::absolute(test::case_data("good") / "minimal-out").lexically_normal());
  CHECK_FALSE(spec.report.out.given);
  CHECK(spec.report.averaging_radius.value == Approx(0.05));  // half the thinnest layer
  CHECK(spec.report.fields.value);
  CHECK(spec.report.profiles.value);
  CHECK(spec.variants.empty());
  CHECK_FALSE(spec.sweep.has_value());
}

TEST_CASE("values keep the file, line and column they came from", "[casefile][locations]") {
  const CaseSpec spec = read_case_text(test::minimal_case(), "where.toml", test::test_library());
  CHECK(spec.layers[1].thickness.where.file == "where.toml");
  CHECK(spec.layers[1].thickness.where.line == 17);
  CHECK(spec.layers[1].thickness.where.column == 13);
  CHECK(spec.layers[1].where.line == 13);  // the [[layer]] header
  CHECK(spec.load.strain.where.line == 21);
  CHECK(spec.geometry.width.where.to_string() == "where.toml:5:9");
}

TEST_CASE("every key of a stretched strip is read, in nanometres", "[casefile][keys]") {
  const CaseSpec spec = good_case("every-key-stretch.toml");
  CHECK(spec.title.value == "every key, stretch");
  CHECK(spec.units.value == LengthUnit::nm);
  REQUIRE(spec.material_files.size() == 1);
  CHECK(spec.material_files[0].value == "extra-materials.toml");
  CHECK(spec.geometry.width.value == length(200.0));
  CHECK(spec.geometry.symmetric.given);

  REQUIRE(spec.layers.size() == 5);
  CHECK(spec.layers[0].elements_through.value == 6);
  CHECK(spec.layers[1].elements_through.value == 4);  // from [mesh]
  CHECK(spec.layers[1].thickness.value == length(0.15));
  CHECK(spec.layers[2].thickness.value == length(0.1));
  CHECK(spec.layers[3].role.value == LayerRole::adhesive);
  CHECK(spec.layers[4].role.value == LayerRole::encapsulant);

  REQUIRE(spec.defects.size() == 3);
  CHECK(spec.defects[0].kind.value == DefectKind::pinhole);
  CHECK(spec.defects[0].fill.value == DefectFill::empty);
  CHECK(spec.defects[0].size.value == length(2.0));
  CHECK(spec.defects[1].kind.value == DefectKind::thin_spot);
  CHECK(spec.defects[1].at.value == length(50.0));
  CHECK(spec.defects[1].depth.value == 0.4);
  CHECK(spec.defects[1].taper.value == length(1.0));
  CHECK(spec.defects[1].fill.value == DefectFill::above);
  CHECK(spec.defects[2].kind.value == DefectKind::delamination);
  CHECK(spec.defects[2].below.value == "base");
  CHECK(spec.defects[2].host_layer().value == "base");

  CHECK(spec.load.strain.value == 0.25);
  CHECK(spec.load.lateral.value.mode == LateralMode::imposed);
  CHECK(spec.load.lateral.value.strain == 0.05);
  CHECK(spec.load.steps.value == 20);
  CHECK(spec.load.max_steps.value == 400);

  CHECK(spec.mesh.size_near.value == length(0.04));
  CHECK(spec.mesh.size_far.value == length(4.0));
  CHECK(spec.mesh.grade_over.value == length(30.0));
  CHECK(spec.mesh.order.value == 1);
  CHECK(spec.report.out.value ==
        std::filesystem::absolute(test::case_data("good") / "results/every-key").lexically_normal());
  CHECK(spec.report.averaging_radius.value == length(0.025));
  CHECK_FALSE(spec.report.fields.value);
  CHECK_FALSE(spec.report.profiles.value);

  REQUIRE(spec.variants.size() == 2);
  CHECK(spec.variants[0].remove.size() == 2);
  CHECK(spec.variants[1].set.size() == 7);
  REQUIRE(spec.sweep.has_value());
  CHECK(spec.sweep->range.has_value());
  CHECK(spec.sweep->values.size() == 3);
}

TEST_CASE("every key of a bent full strip is read, in millimetres", "[casefile][keys]") {
  const CaseSpec spec = good_case("every-key-bend.toml");
  CHECK_FALSE(spec.geometry.symmetric.value);
  CHECK(spec.geometry.width.value == length(300.0));
  CHECK(spec.layers[1].thickness.value == length(0.05));
  CHECK(spec.defects[0].at.value == length(-100.0));
  CHECK(spec.defects[0].fill.value == DefectFill::empty);  // top layer: nothing above to fill
  REQUIRE(spec.load.radius.value.size() == 2);
  CHECK(spec.load.radius.value[0] == length(5000.0));
  CHECK(spec.load.radius.value[1] == length(-5000.0));
  CHECK(spec.load.lateral.value.mode == LateralMode::free);
  CHECK(spec.load.lateral.given);
  CHECK(spec.load.steps.value == 5);
  CHECK(spec.load.max_steps.value == 50);
  REQUIRE(spec.sweep.has_value());
  CHECK(spec.sweep->values.size() == 2);
}

TEST_CASE("a bend without lateral is held (plane strain)", "[casefile][defaults]") {
  std::string text = test::minimal_case();
  text.replace(text.find("kind = \"stretch\"\nstrain = 0.1"), 29, "kind = \"bend\"\nradius = 500");
  const CaseSpec spec = read_case_text(text, "bend.toml", test::test_library());
  CHECK(spec.load.lateral.value.mode == LateralMode::held);
  CHECK_FALSE(spec.load.lateral.given);
  REQUIRE(spec.load.radius.value.size() == 1);  // a single radius is a list of one
  CHECK(spec.load.radius.value[0] == 500.0);
}

TEST_CASE("every key of a pressed disk is read, in metres", "[casefile][keys]") {
  const CaseSpec spec = good_case("every-key-press.toml");
  CHECK(spec.geometry.shape.value == Shape::disk);
  CHECK(spec.geometry.width.value == length(500.0));
  CHECK(spec.layers[1].thickness.value == length(0.05));
  CHECK(spec.load.kind.value == LoadKind::conform);
  CHECK(spec.load.surface.value == SurfaceKind::sphere);
  CHECK(spec.load.surface_radius.value == length(2000.0));
  CHECK(spec.load.method.value == ConformMethod::press);
  CHECK(spec.load.ring.value == length(450.0));
  CHECK(spec.load.travel.value == length(40.0));
  CHECK(spec.load.contact.value == ContactKind::bonded);
  CHECK_FALSE(spec.load.local.value);
  REQUIRE(spec.load.local_at.value.has_value());
  CHECK(*spec.load.local_at.value == length(100.0));
  CHECK(spec.load.steps.value == 8);
  CHECK(spec.load.max_steps.value == 80);
}

TEST_CASE("conform defaults: wrap, frictionless, ring at the width, local with defects",
          "[casefile][defaults]") {
  const CaseSpec ellipsoid = good_case("every-key-ellipsoid.toml");
  CHECK(ellipsoid.load.surface.value == SurfaceKind::ellipsoid);
  CHECK(ellipsoid.load.semi_axes.value == std::array<double, 2>{3000.0, 1500.0});
  CHECK(ellipsoid.load.method.value == ConformMethod::wrap);
  CHECK(ellipsoid.load.method.given);
  CHECK_FALSE(ellipsoid.load.local.value);  // no defects
  CHECK(ellipsoid.load.ring.value == 400.0);  // geometry.width
  CHECK(ellipsoid.load.contact.value == ContactKind::frictionless);
  CHECK_FALSE(ellipsoid.load.local_at.value.has_value());

  const CaseSpec profile = good_case("every-key-profile.toml");
  CHECK(profile.load.surface.value == SurfaceKind::profile);
  REQUIRE(profile.load.points.value.size() == 4);
  CHECK(profile.load.points.value[2] == std::array<double, 2>{400.0, -20.0});
  CHECK(profile.load.method.value == ConformMethod::wrap);
  CHECK_FALSE(profile.load.method.given);
  CHECK(profile.load.local.value);  // a defect is given
  CHECK_FALSE(profile.load.local.given);
  CHECK(profile.defects[0].at.value == 0.0);
  CHECK_FALSE(profile.defects[0].at.given);
  CHECK(profile.defects[0].fill.value == DefectFill::empty);
}

TEST_CASE("thin-spot defaults: a step (taper 0) filled from above", "[casefile][defaults]") {
  std::string text = test::minimal_case();
  text += "\n[[defect]]\nkind = \"thin-spot\"\nlayer = \"base\"\nsize = 6\ndepth = 0.25\n";
  const CaseSpec spec = read_case_text(text, "spot.toml", test::test_library());
  REQUIRE(spec.defects.size() == 1);
  CHECK(spec.defects[0].taper.value == 0.0);
  CHECK_FALSE(spec.defects[0].taper.given);
  CHECK(spec.defects[0].fill.value == DefectFill::above);
  CHECK(spec.defects[0].at.value == 0.0);
}

TEST_CASE("the same stack in nm, um, mm and m reads the same", "[casefile][units]") {
  // 1 um = 1e3 nm = 1e-3 mm = 1e-6 m (SI prefixes, BIPM SI Brochure, 9th ed., 2019).
  struct Spelling {
    const char* unit;
    const char* width;
    const char* thick;
    const char* thin;
  };
  const Spelling spellings[] = {{"nm", "100000", "50000", "100"},
                                {"um", "100", "50", "0.1"},
                                {"mm", "0.1", "0.05", "0.0001"},
                                {"m", "0.0001", "0.00005", "1e-7"}};
  for (const Spelling& spelling : spellings) {
    std::string text = test::minimal_case();
    text.replace(text.find("width = 100.0"), 13, std::string("width = ") + spelling.width);
    text.replace(text.find("thickness = 50.0"), 16, std::string("thickness = ") + spelling.thick);
    text.replace(text.find("thickness = 0.1"), 15, std::string("thickness = ") + spelling.thin);
    text = std::string("units = \"") + spelling.unit + "\"\n" + text;
    const CaseSpec spec = read_case_text(text, "units.toml", test::test_library());
    INFO("unit " << spelling.unit);
    CHECK(spec.geometry.width.value == length(100.0));
    CHECK(spec.layers[0].thickness.value == length(50.0));
    CHECK(spec.layers[1].thickness.value == length(0.1));
    CHECK(spec.mesh.size_near.value == length(0.05));
    CHECK(spec.load.strain.value == 0.1);  // strains are fractions in every unit
  }
}

TEST_CASE("integers are accepted for lengths and fractions", "[casefile][types]") {
  std::string text = test::minimal_case();
  text.replace(text.find("strain = 0.1"), 12, "strain = 1");
  const CaseSpec spec = read_case_text(text, "int.toml", test::test_library());
  CHECK(spec.load.strain.value == 1.0);
  CHECK(spec.layers[0].thickness.value == 50.0);
}

TEST_CASE("every declared key is used by at least one good test case", "[casefile][keys]") {
  std::string all;
  for (const char* name :
       {"every-key-stretch.toml", "every-key-bend.toml", "every-key-press.toml",
        "every-key-ellipsoid.toml", "every-key-profile.toml", "row-of-slits.toml"}) {
    all += test::read_text(test::case_data("good") / name);
  }
  for (const KeyInfo& key : case_key_table()) {
    INFO("key " << key.path());
    const bool written = all.find("\n" + std::string(key.name) + " = ") != std::string::npos ||
                         all.find("[" + std::string(section_name(key.section)) + "]") !=
                             std::string::npos && key.section == CaseSection::sweep;
    CHECK(written);
  }
}

TEST_CASE("read_case loads the built-in library and the case's material files",
          "[casefile][materials]") {
  const CaseSpec spec = read_case(test::case_data("good") / "every-key-stretch.toml");
  CHECK(spec.library.find("test-extra-film") != nullptr);  // from the case's file
  CHECK(spec.library.find("p3ht") != nullptr);             // built in
  const std::vector<std::filesystem::path> paths = case_material_paths(spec);
  REQUIRE(paths.size() == 1);
  CHECK(std::filesystem::exists(paths[0]));
}

TEST_CASE("a material file that does not exist is named at the materials line",
          "[casefile][materials]") {
  std::string text = "materials = [\"nowhere.toml\"]\n" + std::string(test::minimal_case());
  const std::filesystem::path file = std::filesystem::temp_directory_path() / "plystrain-missing-materials.toml";
  {
    std::ofstream out(file);
    out << text;
  }
  try {
    static_cast<void>(read_case(file));
    FAIL("expected an InputError");
  } catch (const InputError& error) {
    CHECK(error.problems().front().where.line == 1);
    CHECK(error.problems().front().key_path == "materials");
    CHECK_THAT(std::string(error.what()), Catch::Matchers::Contains("nowhere.toml"));
  }
  std::filesystem::remove(file);
}
