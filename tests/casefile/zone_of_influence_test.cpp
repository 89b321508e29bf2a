// The stack's load-transfer length, the zone of influence of a defect and
// the width a case chooses when it gives none.
#include "case_test_support.hpp"

#include "plystrain/solver/material_library.hpp"
#include "plystrain/solver/zone_of_influence.hpp"

#include <cmath>

using plystrain::CaseSpec;
using plystrain::read_case_text;
namespace test = plystrain::test;

namespace {

// A film of `film_thickness` um of p3ht on a base of `base_thickness` um of
// silicone-10to1 with a slit of 2 um, no width given.
std::string film_on_base(double base_thickness, double film_thickness) {
  return "format = 1\n[geometry]\nshape = \"strip\"\n"
         "[[layer]]\nname = \"base\"\nrole = \"substrate\"\nmaterial = \"silicone-10to1\"\n"
         "thickness = " +
         std::to_string(base_thickness) +
         "\n"
         "[[layer]]\nname = \"film\"\nrole = \"active\"\nmaterial = \"p3ht\"\n"
         "thickness = " +
         std::to_string(film_thickness) +
         "\n"
         "[[defect]]\nkind = \"slit\"\nlayer = \"film\"\nsize = 2\n"
         "[load]\nkind = \"stretch\"\nstrain = 0.1\n";
}

double plane_modulus(const CaseSpec& spec, const std::string& key, double* shear = nullptr) {
  const auto& law = spec.library.find(key)->law;
  const double mu = plystrain::materials::initial_shear_modulus(law);
  const auto young =
      plystrain::materials::to_young_poisson(mu, plystrain::materials::initial_bulk_modulus(law));
  if (shear != nullptr) {
    *shear = mu;
  }
  return young.youngs_modulus / (1.0 - young.poisson_ratio * young.poisson_ratio);
}

}  // namespace

TEST_CASE("load-transfer length of a film on a deep and on a thin compliant base",
          "[casefile][zone]") {
  // Shear lag (derived in zone_of_influence.hpp): on a base deeper than the
  // length, the base holds the film like a half-space, k ~ Ebar_s / L, and
  // Ebar_f h_f u'' = k u gives L = Ebar_f h_f / Ebar_s; on a thin base it is
  // a shear layer, k = G_s / h_s, and L = sqrt(Ebar_f h_f h_s / G_s).
  {
    const CaseSpec deep =
        read_case_text(film_on_base(1000.0, 0.1), "deep.toml", plystrain::load_builtin_library());
    const double film = plane_modulus(deep, "p3ht");
    const double base = plane_modulus(deep, "silicone-10to1");
    const plystrain::StackScales scales = plystrain::stack_scales(deep.layers, deep.library);
    CHECK(scales.transfer_length == Approx(film * 0.1 / base).epsilon(1e-9));
    CHECK(scales.thickness == Approx(1000.1));
  }
  {
    const CaseSpec thin =
        read_case_text(film_on_base(5.0, 1.0), "thin.toml", plystrain::load_builtin_library());
    double shear = 0.0;
    const double film = plane_modulus(thin, "p3ht");
    static_cast<void>(plane_modulus(thin, "silicone-10to1", &shear));
    const plystrain::StackScales scales = plystrain::stack_scales(thin.layers, thin.library);
    CHECK(scales.transfer_length == Approx(std::sqrt(film * 1.0 * 5.0 / shear)).epsilon(1e-6));
  }
}

TEST_CASE("a case without a width is made wide enough to isolate its defects", "[casefile][zone]") {
  const CaseSpec spec =
      read_case_text(film_on_base(100.0, 0.1), "wide.toml", plystrain::load_builtin_library());
  const plystrain::StackScales scales = plystrain::stack_scales(spec.layers, spec.library);
  const double zone = plystrain::zone_of_influence(spec.defects[0], scales);
  // The slit reaches 1 um; its zone three transfer lengths (or three stack
  // thicknesses) further; the width covers that twice over.
  CHECK(zone == Approx(1.0 + 3.0 * std::max(scales.transfer_length, scales.thickness)));
  CHECK_FALSE(spec.geometry.width.given);
  CHECK(spec.geometry.width.value == Approx(1.0 + 2.0 * (zone - 1.0)));
  // The far mesh follows the width (width / 40), so the wide cell stays cheap.
  CHECK(spec.mesh.size_far.value == Approx(spec.geometry.width.value / 40.0));
}

TEST_CASE("a stated defect spacing sets the half-width, and width and spacing together are refused",
          "[casefile][zone]") {
  std::string text = film_on_base(100.0, 0.1);
  text.insert(text.find("[[layer]]"), "defect_spacing = 300\n");
  const CaseSpec row = read_case_text(text, "row.toml", plystrain::load_builtin_library());
  CHECK(row.geometry.width.value == Approx(150.0));
  CHECK(row.geometry.defect_spacing.given);

  text.insert(text.find("defect_spacing"), "width = 100\n");
  CHECK_THROWS_WITH(read_case_text(text, "both.toml", plystrain::load_builtin_library()),
                    Catch::Matchers::Contains("geometry.defect_spacing") &&
                        Catch::Matchers::Contains("either a width or a defect spacing"));
}
