// validate(): parameters a law cannot use are refused with a message that
// says what to do.
#include "materials/law_test_support.hpp"

#include <catch2/catch.hpp>

using namespace plystrain::materials;
using namespace plystrain::materials::testing;
using Catch::Matchers::Contains;

TEST_CASE("usable parameters pass validation", "[materials][validate]") {
  for (const NamedLaw& named : every_kind()) {
    INFO(named.name);
    CHECK(validate(named.law).empty());
  }
  CHECK(validate(linear_elastic(1.0, 0.4999)).empty());
  CHECK(validate(linear_elastic(1.0, -0.99)).empty());
}

TEST_CASE("poisson_ratio = 0.5 is refused with the 0.4999 hint", "[materials][validate]") {
  for (const ModelKind kind : {ModelKind::linear_elastic, ModelKind::neo_hookean}) {
    LawParameters law = linear_elastic(1.0, 0.5);
    law.kind = kind;
    const std::string message = validate(law);
    CHECK_THAT(message, Contains("0.4999"));
    CHECK_THAT(message, Contains("poisson_ratio"));
  }
}

TEST_CASE("out-of-range parameters are refused", "[materials][validate]") {
  CHECK_THAT(validate(linear_elastic(1.0, 0.6)), Contains("(-1, 0.5)"));
  CHECK_THAT(validate(linear_elastic(1.0, -1.0)), Contains("(-1, 0.5)"));
  CHECK_THAT(validate(linear_elastic(0.0, 0.3)), Contains("youngs_modulus"));
  CHECK_THAT(validate(linear_elastic(-2.0, 0.3)), Contains("youngs_modulus"));
  CHECK_THAT(validate(neo_hookean(-1.0, 5.0)), Contains("shear_modulus"));
  CHECK_THAT(validate(neo_hookean(1.0, 0.0)), Contains("bulk_modulus"));
  CHECK_THAT(validate(neo_hookean(0.0, 0.0)), Contains("shear_modulus"));
  CHECK_THAT(validate(mooney_rivlin(-0.3, 0.1, 4.0)), Contains("2 (c10 + c01)"));
  CHECK_THAT(validate(mooney_rivlin(0.3, 0.1, 0.0)), Contains("bulk_modulus"));
  CHECK_THAT(validate(yeoh(0.0, 0.1, 0.0, 4.0)), Contains("c10"));
  CHECK_THAT(validate(gent(1.0, 0.0, 4.0)), Contains("jm"));
  CHECK_THAT(validate(gent(0.0, 10.0, 4.0)), Contains("shear_modulus"));

  // Both (E, nu) and a different (mu, kappa): ambiguous.
  LawParameters both = neo_hookean(1.0, 5.0);
  both.youngs_modulus = 3.0;
  both.poisson_ratio = 0.3;
  CHECK_THAT(validate(both), Contains("not both"));
}

TEST_CASE("Ogden arrays are checked", "[materials][validate]") {
  LawParameters law = ogden_1972(4.0);
  law.ogden_alpha.pop_back();
  CHECK_THAT(validate(law), Contains("equal length"));
  law = ogden_1972(4.0);
  law.ogden_mu = {};
  law.ogden_alpha = {};
  CHECK_THAT(validate(law), Contains("equal length"));
  law = ogden_1972(4.0);
  law.ogden_mu = {-0.63, 0.0012, -0.01};  // sum(mu alpha)/2 < 0
  CHECK_THAT(validate(law), Contains("sum(mu_i alpha_i)/2"));
  law = ogden_1972(4.0);
  law.ogden_alpha[1] = 0.0;
  CHECK_THAT(validate(law), Contains("alpha[1]"));
  law = ogden_1972(0.0);
  CHECK_THAT(validate(law), Contains("bulk_modulus"));
}
