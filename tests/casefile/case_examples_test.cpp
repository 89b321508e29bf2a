// Every example case in cases/ reads against the built-in library, with its
// variants and sweep; the generated reference page is up to date.
#include "case_test_support.hpp"

#include "plystrain/solver/case_variants.hpp"
#include "plystrain/solver/key_table.hpp"

#include <fstream>

using namespace plystrain;

namespace {

std::vector<std::filesystem::path> example_cases() {
  std::vector<std::filesystem::path> files;
  for (const auto& entry : std::filesystem::directory_iterator(test::source_dir() / "cases")) {
    if (entry.is_directory() && std::filesystem::exists(entry.path() / "case.toml")) {
      files.push_back(entry.path() / "case.toml");
    }
  }
  std::sort(files.begin(), files.end());
  return files;
}

std::filesystem::path reference_page() {
  return test::source_dir() / "docs" / "case-format-reference.md";
}

}  // namespace

TEST_CASE("every example case reads with the built-in library", "[casefile][examples]") {
  const std::vector<std::filesystem::path> files = example_cases();
  CHECK(files.size() >= 4);
  for (const std::filesystem::path& file : files) {
    INFO(file.string());
    CHECK(std::filesystem::exists(file.parent_path() / "README.md"));
    try {
      const CaseSpec spec = read_case(file);
      CHECK(spec.name() == file.parent_path().filename().string());
      CHECK(spec.title.given);
      for (const ResolvedCase& variant : resolve_variants(spec)) {
        CHECK_FALSE(variant.spec.layers.empty());
      }
    } catch (const InputError& error) {
      FAIL(error.what());
    }
  }
}

TEST_CASE("the named example cases show what they are for", "[casefile][examples]") {
  const std::filesystem::path cases = test::source_dir() / "cases";
  const CaseSpec sensor = read_case(cases / "sensor-patch-scratch" / "case.toml");
  CHECK(sensor.load.kind.value == LoadKind::stretch);
  REQUIRE_FALSE(sensor.defects.empty());
  CHECK(sensor.defects[0].kind.value == DefectKind::pinhole);
  const std::vector<ResolvedCase> variants = resolve_variants(sensor);
  REQUIRE(variants.size() >= 1);
  CHECK(variants[0].name == "bare");
  CHECK(variants[0].spec.layers.size() < sensor.layers.size());

  const CaseSpec debond = read_case(cases / "thin-spot-debond" / "case.toml");
  bool thin_spot = false;
  bool delamination = false;
  for (const DefectSpec& defect : debond.defects) {
    thin_spot = thin_spot || defect.kind.value == DefectKind::thin_spot;
    delamination = delamination || defect.kind.value == DefectKind::delamination;
  }
  CHECK(thin_spot);
  CHECK(delamination);

  const CaseSpec wrist = read_case(cases / "wrist-foil-bend" / "case.toml");
  CHECK(wrist.load.kind.value == LoadKind::bend);
  CHECK(wrist.load.radius.value.size() == 2);

  const CaseSpec dome = read_case(cases / "dome-cell" / "case.toml");
  CHECK(dome.geometry.shape.value == Shape::disk);
  CHECK(dome.load.kind.value == LoadKind::conform);
  CHECK(dome.load.surface.value == SurfaceKind::sphere);
  CHECK(dome.load.method.value == ConformMethod::wrap);
}

TEST_CASE("the reference page lists every declared key", "[casefile][reference]") {
  const std::string page = render_case_format_reference();
  for (const KeyInfo& key : case_key_table()) {
    INFO(key.path());
    CHECK_THAT(page, Catch::Matchers::Contains("| `" + std::string(key.name) + "` |"));
  }
}

TEST_CASE("docs/case-format-reference.md is the current render of the key table",
          "[casefile][reference]") {
  const std::string page = render_case_format_reference();
  const std::string on_disk = test::read_text(reference_page());
  if (on_disk != page) {
    FAIL("docs/case-format-reference.md is stale; regenerate it with "
         "`plystrain_tests_casefile \"[.regenerate]\"` (or `plystrain reference > "
         "docs/case-format-reference.md`)");
  }
}

// Hidden (run only by name or tag): writes the reference page from the table.
TEST_CASE("regenerate docs/case-format-reference.md", "[.regenerate]") {
  std::ofstream out(reference_page(), std::ios::binary | std::ios::trunc);
  out << render_case_format_reference();
  REQUIRE(out.good());
}
