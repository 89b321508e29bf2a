// The material library: the built-in materials/library.toml parses and every
// entry carries its provenance; user files override by key; malformed user
// files are refused with the file, line and key of the problem.
#include "plystrain/materials/builtin_library.hpp"
#include "plystrain/solver/input_error.hpp"
#include "plystrain/solver/material_library.hpp"

#include <catch2/catch.hpp>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <set>
#include <sstream>
#include <string>

#include <unistd.h>

using namespace plystrain;
using Catch::Matchers::Contains;

namespace {

std::filesystem::path data_file(const std::string& name) {
  return std::filesystem::path(PLYSTRAIN_TEST_DATA_DIR) / "materials" / name;
}

// 1-based line of the first line of `file` containing `text`: the expected
// line of an error is read from the data file itself, not hard-coded.
int line_containing(const std::filesystem::path& file, const std::string& text) {
  std::ifstream stream(file);
  std::string line;
  for (int number = 1; std::getline(stream, line); ++number) {
    if (line.find(text) != std::string::npos) {
      return number;
    }
  }
  FAIL("data file " << file << " has no line containing " << text);
  return 0;
}

// Loads `name` and returns the problem reported at `key_path` (a file may
// have several: an unknown key also leaves a required parameter missing).
InputProblem problem_at(const std::string& name, const std::string& key_path) {
  try {
    (void)load_material_library({data_file(name)});
  } catch (const InputError& error) {
    for (const InputProblem& problem : error.problems()) {
      if (problem.key_path == key_path) {
        return problem;
      }
    }
    FAIL("no problem at " << key_path << " in: " << error.what());
  }
  FAIL("no InputError for " << name);
  return {};
}

double youngs_modulus(const materials::MaterialRecord& record) {
  return materials::to_young_poisson(materials::initial_shear_modulus(record.law),
                                     materials::initial_bulk_modulus(record.law))
      .youngs_modulus;
}

double poisson_ratio(const materials::MaterialRecord& record) {
  return materials::to_young_poisson(materials::initial_shear_modulus(record.law),
                                     materials::initial_bulk_modulus(record.law))
      .poisson_ratio;
}

}  // namespace

TEST_CASE("the built-in library parses and every entry carries its provenance",
          "[materials][library]") {
  const MaterialLibrary library = load_builtin_library();
  const std::set<std::string> bases = {"published", "from-memory", "measured", "demo"};
  const std::set<std::string> methods = {"tensile",     "wrinkling", "film-on-water",
                                         "indentation", "datasheet", "assumed"};
  CHECK(library.records().size() >= 26);
  for (const auto& [key, record] : library.records()) {
    INFO(key);
    CHECK(record.key == key);
    CHECK_FALSE(record.source.empty());
    CHECK(bases.count(record.basis) == 1);
    CHECK(methods.count(record.method) == 1);
    CHECK(materials::initial_shear_modulus(record.law) > 0.0);
    CHECK(materials::initial_bulk_modulus(record.law) > 0.0);
    CHECK(materials::validate(record.law).empty());
    CHECK(record.defined_in == materials::builtin_library_name);
    if (record.crack_onset_strain) {
      CHECK(*record.crack_onset_strain > 0.0);
    }
    // An entry built on a recalled value must say so in its source.
    if (record.basis == "from-memory") {
      CHECK_THAT(record.source, Contains("from memory"));
    }
  }
}

TEST_CASE("the built-in library holds the materials the design asks for",
          "[materials][library]") {
  const MaterialLibrary library = load_builtin_library();
  for (const char* key :
       {"silicone-10to1", "silicone-soft", "sebs-elastomer", "tpu-film", "pet-foil", "pen-foil",
        "polyimide-foil", "parylene-c", "pedot-pss", "pedot-pss-plasticised", "ito", "gold",
        "silver", "aluminium", "copper", "silver-nanowire-network", "p3ht", "pbttt",
        "p3ht-pcbm-blend", "pm6-y6-blend", "mapbi3-perovskite", "zinc-oxide", "alumina-barrier",
        "demo-elastomer", "demo-stiff-film", "demo-encapsulant"}) {
    INFO(key);
    CHECK(library.find(key) != nullptr);
  }

  // Elastomers are nearly incompressible: nu >= 0.499 or kappa >= 1000 mu.
  for (const char* key : {"silicone-10to1", "silicone-soft", "sebs-elastomer", "tpu-film"}) {
    const materials::MaterialRecord& record = *library.find(key);
    const double ratio = materials::initial_bulk_modulus(record.law) /
                         materials::initial_shear_modulus(record.law);
    INFO(key << ": kappa/mu = " << ratio << ", nu = " << poisson_ratio(record));
    CHECK((poisson_ratio(record) >= 0.499 - 1e-12 || ratio >= 1000.0));
  }

  // Johnston, McCluskey, Tan & Tracey, J. Micromech. Microeng. 24, 035017
  // (2014): 10:1 silicone, E = 1.32-2.97 MPa by curing temperature.
  const double silicone = youngs_modulus(*library.find("silicone-10to1"));
  CHECK(silicone >= 1.32 - 1e-9);
  CHECK(silicone <= 2.97 + 1e-9);

  // The soft silicone is a strain-stiffening law with E about 0.05-0.1 MPa.
  const materials::MaterialRecord& soft = *library.find("silicone-soft");
  CHECK((soft.law.kind == materials::ModelKind::gent ||
         soft.law.kind == materials::ModelKind::yeoh));
  CHECK(youngs_modulus(soft) >= 0.05);
  CHECK(youngs_modulus(soft) <= 0.1);

  // The demo materials are defined by the example cases, not by a source.
  const materials::MaterialRecord& demo_elastomer = *library.find("demo-elastomer");
  CHECK(demo_elastomer.basis == "demo");
  CHECK(youngs_modulus(demo_elastomer) == Approx(1.5).epsilon(1e-12));
  CHECK(poisson_ratio(demo_elastomer) == Approx(0.499).epsilon(1e-12));
  CHECK(demo_elastomer.crack_onset_strain == Approx(1.0));
  const materials::MaterialRecord& demo_film = *library.find("demo-stiff-film");
  CHECK(youngs_modulus(demo_film) == Approx(1000.0).epsilon(1e-12));
  CHECK(poisson_ratio(demo_film) == Approx(0.35).epsilon(1e-12));
  CHECK(demo_film.crack_onset_strain == Approx(0.05));
  CHECK(demo_film.yield_strain == Approx(0.02));
  const materials::MaterialRecord& demo_encapsulant = *library.find("demo-encapsulant");
  CHECK(youngs_modulus(demo_encapsulant) == Approx(20.0).epsilon(1e-12));
  CHECK(poisson_ratio(demo_encapsulant) == Approx(0.49).epsilon(1e-12));
  CHECK(demo_encapsulant.crack_onset_strain == Approx(0.8));

  // Both (E, nu) and (mu, kappa) are kept for reports and laws.
  CHECK(demo_film.law.youngs_modulus == Approx(1000.0));
  CHECK(demo_film.law.shear_modulus == Approx(1000.0 / 2.7));
}

TEST_CASE("a user file replaces whole entries by key, a later file winning",
          "[materials][library]") {
  const MaterialLibrary builtin = load_builtin_library();
  REQUIRE(builtin.find("pet-foil")->yield_strain.has_value());

  const MaterialLibrary library = load_material_library({data_file("override.toml")});
  const materials::MaterialRecord& pet = *library.find("pet-foil");
  CHECK(youngs_modulus(pet) == Approx(4000.0).epsilon(1e-12));
  CHECK(pet.basis == "measured");
  CHECK(pet.tested_thickness == "50 um");
  CHECK_FALSE(pet.yield_strain.has_value());  // whole entry replaced, not merged
  CHECK_THAT(pet.defined_in, Contains("override.toml"));
  // Untouched entries stay as built in; new entries are added.
  CHECK(library.find("gold")->defined_in == materials::builtin_library_name);
  CHECK(library.records().size() == builtin.records().size() + 1);
  const materials::MaterialRecord& rubber = *library.find("lab-rubber");
  CHECK(rubber.law.kind == materials::ModelKind::ogden);
  // Ogden (1972): initial shear modulus sum(mu_p alpha_p)/2 = 0.4225 MPa.
  CHECK(materials::initial_shear_modulus(rubber.law) == Approx(0.4225).epsilon(1e-12));

  const MaterialLibrary twice =
      load_material_library({data_file("override.toml"), data_file("override_later.toml")});
  const materials::MaterialRecord& later = *twice.find("pet-foil");
  CHECK(later.law.kind == materials::ModelKind::linear_elastic);
  CHECK(youngs_modulus(later) == Approx(4100.0).epsilon(1e-12));
  CHECK_THAT(later.defined_in, Contains("override_later.toml"));
}

TEST_CASE("malformed user files name file, line and key", "[materials][library]") {
  SECTION("unknown key, with the closest known key as a hint") {
    const InputProblem problem =
        problem_at("unknown_key.toml", "material.my-film.youngs_modulos");
    CHECK_THAT(problem.where.file, Contains("unknown_key.toml"));
    CHECK(problem.where.line == line_containing(data_file("unknown_key.toml"), "youngs_modulos"));
    CHECK(problem.where.column == 1);
    CHECK(problem.key_path == "material.my-film.youngs_modulos");
    CHECK_THAT(problem.message, Contains("did you mean \"youngs_modulus\""));
  }
  SECTION("wrong type") {
    const InputProblem problem =
        problem_at("wrong_type.toml", "material.my-film.youngs_modulus");
    CHECK_THAT(problem.where.file, Contains("wrong_type.toml"));
    CHECK(problem.where.line == line_containing(data_file("wrong_type.toml"), "youngs_modulus"));
    CHECK(problem.key_path == "material.my-film.youngs_modulus");
    CHECK_THAT(problem.message, Contains("expected a number, found a string"));
  }
  SECTION("poisson_ratio = 0.5 suggests 0.4999") {
    const InputProblem problem =
        problem_at("poisson_half.toml", "material.my-rubber.poisson_ratio");
    CHECK(problem.where.line == line_containing(data_file("poisson_half.toml"), "poisson_ratio"));
    CHECK(problem.key_path == "material.my-rubber.poisson_ratio");
    CHECK_THAT(problem.message, Contains("0.4999"));
  }
  SECTION("unknown model, with a hint") {
    const InputProblem problem = problem_at("unknown_model.toml", "material.my-rubber.model");
    CHECK(problem.where.line == line_containing(data_file("unknown_model.toml"), "model"));
    CHECK(problem.key_path == "material.my-rubber.model");
    CHECK_THAT(problem.message, Contains("did you mean \"neo-hookean\""));
  }
  SECTION("neo-Hookean with both moduli pairs") {
    const InputProblem problem =
        problem_at("both_moduli_pairs.toml", "material.my-rubber.shear_modulus");
    CHECK(problem.where.line ==
          line_containing(data_file("both_moduli_pairs.toml"), "shear_modulus"));
    CHECK_THAT(problem.message, Contains("not both"));
  }
  SECTION("Ogden arrays of different length") {
    const InputProblem problem = problem_at("mismatched_ogden.toml", "material.my-rubber.mu");
    CHECK(problem.where.line == line_containing(data_file("mismatched_ogden.toml"), "mu ="));
    CHECK(problem.key_path == "material.my-rubber.mu");
    CHECK_THAT(problem.message, Contains("equal length"));
  }
  SECTION("a modulus or a limit strain outside the range of real materials") {
    const InputProblem denormal =
        problem_at("out_of_range.toml", "material.my-film.youngs_modulus");
    CHECK(denormal.where.line == line_containing(data_file("out_of_range.toml"), "5e-324"));
    CHECK_THAT(denormal.message, Contains("from 1e-06 to 1e+07"));
    const InputProblem strain =
        problem_at("out_of_range.toml", "material.my-film.crack_onset_strain");
    CHECK_THAT(strain.message, Contains("from 1e-06 to 10, found 1e+06"));
    const InputProblem shear = problem_at("out_of_range.toml", "material.my-gel.shear_modulus");
    CHECK_THAT(shear.message, Contains("found 1e+09"));
    const InputProblem bulk = problem_at("out_of_range.toml", "material.my-gel.bulk_modulus");
    CHECK_THAT(bulk.message, Contains("from 1e-06 to 1e+10, found 1e+300"));
  }
  SECTION("control characters in a string or a key") {
    const InputProblem source = problem_at("control_characters.toml", "material.my-film.source");
    CHECK(source.where.line == line_containing(data_file("control_characters.toml"), "2J"));
    CHECK_THAT(source.message,
               Contains("without control characters, found \"test data \\u001B[2J\""));
    const InputProblem key = problem_at("control_characters.toml", "material.ev\\u0007il");
    CHECK_THAT(key.message, Contains("expected a material key"));
  }
  SECTION("nesting too deep for the TOML parser") {
    const std::filesystem::path file = std::filesystem::temp_directory_path() /
                                       ("plystrain-deep-" + std::to_string(::getpid()) + ".toml");
    std::string key = "a";
    for (int i = 0; i < 50000; ++i) {
      key += ".a";
    }
    std::ofstream(file) << "# a dotted key 50,001 parts deep\n" << key << " = 1\n";
    try {
      static_cast<void>(load_material_library({file}));
      FAIL("a 50,001-part key was read");
    } catch (const InputError& error) {
      CHECK(error.problems().front().where.line == 2);
      CHECK_THAT(error.what(), Contains("nested at most 16 levels deep"));
    }
    std::filesystem::remove(file);
  }
  SECTION("invalid TOML") {
    const InputProblem problem = problem_at("not_toml.toml", "");
    CHECK(problem.where.line == line_containing(data_file("not_toml.toml"), "= ="));
    CHECK_THAT(problem.message, Contains("not valid TOML"));
  }
  SECTION("a missing file") {
    const InputProblem problem = problem_at("no_such_file.toml", "");
    CHECK_THAT(problem.where.file, Contains("no_such_file.toml"));
    CHECK_THAT(problem.message, Contains("cannot read"));
  }
}

TEST_CASE("every problem in a file is reported at once", "[materials][library]") {
  // bad_provenance.toml has an unknown basis and no source.
  try {
    (void)load_material_library({data_file("bad_provenance.toml")});
    FAIL("no InputError");
  } catch (const InputError& error) {
    REQUIRE(error.problems().size() == 2);
    std::vector<std::string> paths;
    for (const InputProblem& problem : error.problems()) {
      paths.push_back(problem.key_path);
    }
    std::sort(paths.begin(), paths.end());
    CHECK(paths == std::vector<std::string>{"material.my-film.basis", "material.my-film.source"});
    CHECK_THAT(std::string(error.what()), Contains("\"guessed\""));
    CHECK_THAT(std::string(error.what()), Contains("bad_provenance.toml:"));
  }
}

TEST_CASE("listings show every material and every field", "[materials][library]") {
  const MaterialLibrary library = load_builtin_library();
  const std::string table = format_material_table(library);
  std::istringstream lines(table);
  std::string header;
  std::getline(lines, header);
  CHECK_THAT(header, Contains("E [MPa]"));
  CHECK_THAT(header, Contains("basis"));
  std::size_t rows = 0;
  for (std::string line; std::getline(lines, line);) {
    ++rows;
  }
  CHECK(rows == library.records().size());
  for (const std::string& key : library.keys()) {
    CHECK_THAT(table, Contains(key));
  }
  CHECK_THAT(table, Contains("1.32"));  // silicone-10to1, MPa

  const std::string detail = format_material_detail(*library.find("alumina-barrier"));
  CHECK_THAT(detail, Contains("Jen, Bertrand & George"));
  CHECK_THAT(detail, Contains("50 nm"));
  CHECK_THAT(detail, Contains("published"));
  CHECK_THAT(detail, Contains("tensile"));
  CHECK_THAT(detail, Contains("1 %"));

  CHECK(library.closest_key("pet-fiol") == "pet-foil");
  CHECK(library.closest_key("unobtainium").empty());
}
