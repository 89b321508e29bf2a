// End-to-end checks of what a run and a comparison write, read back the way
// their users read them: the ParaView files with VTK's own XML reader and
// parser, results.json against the keys and types documented in
// results-format.md (and its notes), and the comparison files of `compare`.
#include "cli/cli_support.hpp"
#include "cli/field_readback.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

#include <vtkCellData.h>
#include <vtkCellType.h>
#include <vtkDataArray.h>
#include <vtkFieldData.h>
#include <vtkIdList.h>
#include <vtkPointData.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <limits>
#include <map>
#include <set>
#include <sstream>
#include <string>
#include <utility>
#include <vector>

using plystrain::test::data_path;
using plystrain::test::read_text;
using plystrain::test::run_plystrain;

namespace {

std::filesystem::path run_to(const std::string& command, const std::string& case_file,
                             const std::string& name) {
  const std::filesystem::path out = plystrain::test::fresh_output_dir(name);
  const auto result = run_plystrain(command + " '" + data_path(case_file) + "' --out '" +
                                    out.string() + "' --threads 1");
  INFO(result.out << "\n" << result.err);
  REQUIRE(result.exit_code == 0);
  return out;
}

nlohmann::json json_file(const std::filesystem::path& path) {
  REQUIRE(std::filesystem::exists(path));
  return nlohmann::json::parse(read_text(path));
}

// The kinds of JSON value results-format.md allows for a key.
enum class Kind { string, integer, number, boolean, array, object, null };

bool has_kind(const nlohmann::json& value, Kind kind) {
  switch (kind) {
    case Kind::string:
      return value.is_string();
    case Kind::integer:
      return value.is_number_integer();
    case Kind::number:
      return value.is_number();
    case Kind::boolean:
      return value.is_boolean();
    case Kind::array:
      return value.is_array();
    case Kind::object:
      return value.is_object();
    case Kind::null:
      return value.is_null();
  }
  return false;
}

void check_keys(const nlohmann::json& object,
                const std::vector<std::pair<std::string, std::vector<Kind>>>& documented,
                const std::string& where) {
  REQUIRE(object.is_object());
  for (const auto& [key, kinds] : documented) {
    INFO(where << "." << key);
    REQUIRE(object.contains(key));
    const nlohmann::json& value = object.at(key);
    CHECK(std::any_of(kinds.begin(), kinds.end(),
                      [&value](Kind kind) { return has_kind(value, kind); }));
  }
}

std::vector<std::string> vtu_files_in(const std::filesystem::path& directory) {
  std::vector<std::string> names;
  for (const auto& entry : std::filesystem::directory_iterator(directory)) {
    if (entry.path().extension() == ".vtu") {
      names.push_back("fields/" + entry.path().filename().string());
    }
  }
  std::sort(names.begin(), names.end());
  return names;
}

std::string step_name(std::size_t index_from_one) {
  std::ostringstream name;
  name << "fields/step-";
  name.width(4);
  name.fill('0');
  name << index_from_one << ".vtu";
  return name.str();
}

}  // namespace

TEST_CASE("fields read back with VTK's readers: cells, points, arrays, collection",
          "[cli][outputs][vtk]") {
  // Source: the VTK XML formats as VTK itself reads them (vtkXMLUnstructured-
  // GridReader, vtkXMLDataParser) and the table of arrays in
  // results-format.md ("ParaView fields") with its notes.
  const std::filesystem::path out = run_to("run", "cli/fields-small-disk.toml", "fields");
  const nlohmann::json results = json_file(out / "results.json");
  REQUIRE(results["completed"] == true);
  const int layer_count = static_cast<int>(results["layers"].size());
  REQUIRE(layer_count == 2);
  const double width = 30.0;   // geometry.width of the case
  const double strain = 2e-3;  // load.strain of the case

  // The collection: well-formed XML, every step file listed once, in order,
  // with increasing load factor as time, ending at the load reached.
  const plystrain::test::CollectionReadback collection =
      plystrain::test::read_collection(out / "fields.pvd");
  REQUIRE(collection.parsed);
  CHECK(collection.root_type == "Collection");
  CHECK(collection.malformed_entries == 0);
  const std::vector<std::string> on_disk = vtu_files_in(out / "fields");
  REQUIRE(!on_disk.empty());
  // One file per converged increment.
  CHECK(on_disk.size() == results["solver"]["increments"].get<std::size_t>());
  REQUIRE(collection.entries.size() == on_disk.size());
  for (std::size_t i = 0; i < collection.entries.size(); ++i) {
    INFO("entry " << i);
    CHECK(collection.entries[i].file == on_disk[i]);
    CHECK(collection.entries[i].file == step_name(i + 1));
    if (i > 0) {
      CHECK(collection.entries[i].timestep > collection.entries[i - 1].timestep);
    }
  }
  CHECK(collection.entries.front().timestep > 0.0);
  CHECK(collection.entries.back().timestep ==
        Approx(results["load_reached"].get<double>()).epsilon(1e-12));

  const std::map<std::string, int> point_arrays = {
      {"displacement", 3}, {"max_principal_strain", 1}, {"min_principal_strain", 1},
      {"log_strain", 6},   {"cauchy_stress", 6},        {"von_mises_stress", 1},
      {"crack_ratio", 1}};
  // crack_onset_strain of each layer's material (check-materials.toml):
  // none for the base, 0.02 for the film.
  const std::vector<double> crack_onset = {0.0, 0.02};

  for (std::size_t step = 0; step < collection.entries.size(); ++step) {
    const plystrain::test::CollectionEntry& entry = collection.entries[step];
    INFO("file " << entry.file);
    const plystrain::test::VtuReadback readback = plystrain::test::read_vtu(out / entry.file);
    REQUIRE(readback.problems == 0);
    REQUIRE(readback.grid != nullptr);
    vtkUnstructuredGrid& grid = *readback.grid;
    const vtkIdType points = grid.GetNumberOfPoints();
    const vtkIdType cells = grid.GetNumberOfCells();
    CHECK(cells == results["mesh"]["elements"].get<vtkIdType>());

    // order = 2 on a structured stack mesh: every cell a 9-node quad.
    for (vtkIdType cell = 0; cell < cells; ++cell) {
      INFO("cell " << cell);
      REQUIRE(grid.GetCellType(cell) == VTK_BIQUADRATIC_QUAD);
    }

    for (const auto& [name, components] : point_arrays) {
      INFO("point array " << name);
      vtkDataArray* array = grid.GetPointData()->GetArray(name.c_str());
      REQUIRE(array != nullptr);
      CHECK(array->GetNumberOfComponents() == components);
      CHECK(array->GetNumberOfTuples() == points);
    }
    vtkDataArray* layer = grid.GetCellData()->GetArray("layer");
    REQUIRE(layer != nullptr);
    CHECK(layer->GetNumberOfComponents() == 1);
    REQUIRE(layer->GetNumberOfTuples() == cells);
    vtkDataArray* time = grid.GetFieldData()->GetArray("TimeValue");
    REQUIRE(time != nullptr);
    CHECK(time->GetComponent(0, 0) == Approx(entry.timestep).epsilon(1e-12));

    // Each point belongs to the cells of exactly one layer (interface nodes
    // are written once per layer), every point is used, and the distinct
    // positions are the mesh nodes of results.json.
    std::vector<int> layer_of_point(static_cast<std::size_t>(points), -1);
    int points_in_two_layers = 0;
    for (vtkIdType cell = 0; cell < cells; ++cell) {
      const int cell_layer = static_cast<int>(layer->GetComponent(cell, 0));
      CHECK(cell_layer >= 0);
      CHECK(cell_layer < layer_count);
      vtkNew<vtkIdList> ids;
      grid.GetCellPoints(cell, ids);
      CHECK(ids->GetNumberOfIds() == 9);
      for (vtkIdType i = 0; i < ids->GetNumberOfIds(); ++i) {
        int& owner = layer_of_point[static_cast<std::size_t>(ids->GetId(i))];
        if (owner >= 0 && owner != cell_layer) {
          ++points_in_two_layers;
        }
        owner = cell_layer;
      }
    }
    CHECK(points_in_two_layers == 0);
    CHECK(std::count(layer_of_point.begin(), layer_of_point.end(), -1) == 0);
    std::set<std::pair<double, double>> positions;
    for (vtkIdType id = 0; id < points; ++id) {
      positions.insert({grid.GetPoint(id)[0], grid.GetPoint(id)[1]});
    }
    CHECK(positions.size() == results["mesh"]["nodes"].get<std::size_t>());

    // crack_ratio = max_principal_strain / crack_onset_strain, 0 where the
    // material gives no onset (results-format.md).
    vtkDataArray* max_strain = grid.GetPointData()->GetArray("max_principal_strain");
    vtkDataArray* crack_ratio = grid.GetPointData()->GetArray("crack_ratio");
    vtkDataArray* displacement = grid.GetPointData()->GetArray("displacement");
    double largest_misfit = 0.0;
    for (vtkIdType id = 0; id < points; ++id) {
      const double onset =
          crack_onset[static_cast<std::size_t>(layer_of_point[static_cast<std::size_t>(id)])];
      const double expected = onset > 0.0 ? max_strain->GetComponent(id, 0) / onset : 0.0;
      largest_misfit =
          std::max(largest_misfit, std::abs(crack_ratio->GetComponent(id, 0) - expected));
      CHECK(displacement->GetComponent(id, 2) == 0.0);
    }
    CHECK(largest_misfit <= 1e-12);

    // The displacement in the file's own units: the rim carries the
    // undisturbed stack's stress, so it moves by about the load factor times
    // strain * width, plus what the pinhole opens up on its own (the mean
    // over the rim's points is within 2 %). A length scale
    // off by a unit (1e3) could not pass.
    int rim_points = 0;
    double rim_sum = 0.0;
    for (vtkIdType id = 0; id < points; ++id) {
      if (std::abs(grid.GetPoint(id)[0] - width) <= 1e-9 * width) {
        ++rim_points;
        rim_sum += displacement->GetComponent(id, 0);
      }
    }
    REQUIRE(rim_points > 0);
    CHECK(rim_sum / rim_points == Approx(entry.timestep * strain * width).epsilon(2e-2));
  }
  std::filesystem::remove_all(out);
}

TEST_CASE("results.json carries every documented key with its documented type",
          "[cli][outputs][results-json]") {
  // Source: results-format.md ("results.json", "Per layer") and
  // docs/results-format-notes.md (additions: case_hash, units, basis,
  // raw_peak_strain, overall_verdicts, headline, verdict, yield_margin and
  // the load factors at the limits).
  const std::filesystem::path out = run_to("run", "cli/fields-small-disk.toml", "results-json");
  const nlohmann::json results = json_file(out / "results.json");
  using enum Kind;
  check_keys(results,
             {{"format", {integer}},
              {"tool_version", {string}},
              {"case", {string}},
              {"case_hash", {string}},
              {"title", {string}},
              {"headline", {string}},
              {"verdict", {string}},
              {"units", {string}},
              {"model", {object}},
              {"completed", {boolean}},
              {"load_reached", {number}},
              {"message", {string}},
              {"layers", {array}},
              {"local", {array}},
              {"conform", {object, null}},
              {"overall_verdicts", {object}},
              {"mesh", {object}},
              {"solver", {object}},
              {"cautions", {array}}},
             "results");
  CHECK(results["format"] == 1);
  CHECK(results["case"] == "fields-small-disk.toml");
  CHECK(results["title"] == "Small film-on-elastomer disk with a pinhole, 0.2 % stretch");
  CHECK(results["units"] == "um");
  CHECK(results["completed"] == true);
  CHECK(results["load_reached"].get<double>() == 1.0);
  CHECK(results["message"] == "");
  check_keys(results["model"],
             {{"shape", {string}}, {"load", {string}}, {"lateral", {string, number, null}}},
             "model");
  CHECK(results["model"]["shape"] == "disk");
  CHECK(results["model"]["load"] == "stretch");
  // lateral applies to strips only.
  CHECK(results["model"]["lateral"].is_null());
  CHECK(results["conform"].is_null());  // stretch, not conform
  check_keys(results["mesh"],
             {{"nodes", {integer}},
              {"elements", {integer}},
              {"unknowns", {integer}},
              {"min_quality", {number}}},
             "mesh");
  CHECK(results["mesh"]["nodes"].get<int>() > 0);
  CHECK(results["mesh"]["elements"].get<int>() > 0);
  CHECK(results["mesh"]["unknowns"].get<int>() > 0);
  check_keys(results["solver"],
             {{"increments", {integer}},
              {"newton_iterations", {integer}},
              {"cutbacks", {integer}},
              {"seconds", {number}}},
             "solver");
  for (const nlohmann::json& caution : results["cautions"]) {
    CHECK(caution.is_string());
  }

  // Per layer: one entry for every layer of the case, bottom to top.
  const std::vector<std::pair<std::string, double>> case_layers = {{"base", 5.0}, {"film", 0.5}};
  REQUIRE(results["layers"].size() == case_layers.size());
  const std::set<std::string> verdicts = {"intact", "yields", "cracks", "unknown"};
  for (std::size_t i = 0; i < case_layers.size(); ++i) {
    const nlohmann::json& layer = results["layers"][i];
    const std::string where = "layers[" + std::to_string(i) + "]";
    check_keys(layer,
               {{"name", {string}},
                {"role", {string}},
                {"material", {string}},
                {"basis", {string}},
                {"thickness", {number}},
                {"peak_strain", {number}},
                {"peak_at", {array}},
                {"raw_peak_strain", {number}},
                {"far_field_strain", {number}},
                {"concentration", {number, null}},
                {"min_strain", {number}},
                {"peak_stress", {number}},
                {"crack_onset_strain", {number, null}},
                {"yield_strain", {number, null}},
                {"crack_margin", {number, null}},
                {"yield_margin", {number, null}},
                {"crack_onset_load_factor", {number, null}},
                {"yield_load_factor", {number, null}},
                {"verdict", {string}}},
               where);
    INFO(where);
    CHECK(layer["name"] == case_layers[i].first);
    CHECK(layer["thickness"].get<double>() == case_layers[i].second);
    REQUIRE(layer["peak_at"].size() == 2);
    CHECK(layer["peak_at"][0].is_number());
    CHECK(layer["peak_at"][1].is_number());
    CHECK(verdicts.contains(layer["verdict"].get<std::string>()));
    CHECK(results["overall_verdicts"].contains(case_layers[i].first));
    // The documented relations between the figures.
    const double peak = layer["peak_strain"].get<double>();
    CHECK(layer["raw_peak_strain"].get<double>() >= peak);  // an average never exceeds the maximum
    CHECK(layer["min_strain"].get<double>() <= peak);
    REQUIRE(layer["concentration"].is_number());
    CHECK(layer["concentration"].get<double>() ==
          Approx(peak / layer["far_field_strain"].get<double>()).epsilon(1e-12));
    if (layer["crack_onset_strain"].is_number()) {
      CHECK(layer["crack_margin"].get<double>() ==
            Approx(1.0 - peak / layer["crack_onset_strain"].get<double>()).epsilon(1e-12));
    } else {
      CHECK(layer["crack_margin"].is_null());
    }
    if (layer["yield_strain"].is_number()) {
      CHECK(layer["yield_margin"].get<double>() ==
            Approx(1.0 - peak / layer["yield_strain"].get<double>()).epsilon(1e-12));
    } else {
      CHECK(layer["yield_margin"].is_null());
    }
    // Under this monotone stretch a layer that does not crack at the full
    // load never reached its onset on the way.
    if (layer["verdict"] != "cracks") {
      CHECK(layer["crack_onset_load_factor"].is_null());
    }
  }
  // The materials' limits (check-materials.toml): the base has none, the
  // film cracks at 2 %, and a 0.2 % stretch leaves it intact.
  CHECK(results["layers"][0]["role"] == "substrate");
  CHECK(results["layers"][0]["material"] == "check-substrate-medium");
  CHECK(results["layers"][0]["crack_onset_strain"].is_null());
  CHECK(results["layers"][0]["verdict"] == "unknown");
  CHECK(results["layers"][1]["role"] == "active");
  CHECK(results["layers"][1]["material"] == "check-film");
  CHECK(results["layers"][1]["basis"] == "demo");
  CHECK(results["layers"][1]["crack_onset_strain"].get<double>() == 0.02);
  CHECK(results["layers"][1]["yield_strain"].is_null());
  CHECK(results["layers"][1]["verdict"] == "intact");
  // Overall: the worst of intact and unknown is intact.
  CHECK(results["verdict"] == "intact");
  CHECK(results["headline"] ==
        "1 of 2 layers intact; 1 layer without limit data: base; load reached 100 %");
  std::filesystem::remove_all(out);
}

TEST_CASE("compare: one directory per run, comparison files, the best run per layer",
          "[cli][outputs][compare]") {
  // Source: results-format.md ("Layout of an output directory": base/ and
  // one directory per variant; comparison.json/.csv/.txt, one row per run
  // and layer) and docs/results-format-notes.md ("Comparison files": the
  // CSV columns, `absent` layers, best = widest crack margin among completed
  // runs, the lowest peak where no run has limit data).
  const std::filesystem::path out = run_to("compare", "cli/compare-small-strip.toml", "compare");
  const std::vector<std::string> runs = {"base", "uncovered", "thick-film"};
  const std::vector<std::string> layers = {"base", "film", "cover"};
  std::map<std::string, nlohmann::json> results;
  for (const std::string& run : runs) {
    INFO("run " << run);
    for (const char* file : {"results.json", "summary.txt", "case.toml", "log.txt"}) {
      CHECK(std::filesystem::exists(out / run / file));
    }
    results[run] = json_file(out / run / "results.json");
    CHECK(results[run]["completed"] == true);
  }
  for (const char* file : {"comparison.json", "comparison.csv", "comparison.txt"}) {
    CHECK(std::filesystem::exists(out / file));
  }

  // The best run of each layer, found here from the runs' own results.json:
  // the widest crack margin among the completed runs that have the layer
  // (film and cover have a crack onset); the lowest peak strain for the base,
  // which has no limit data in any run.
  std::map<std::string, std::string> best_run;
  for (const std::string& layer_name : layers) {
    double best_score = -std::numeric_limits<double>::infinity();
    for (const std::string& run : runs) {
      for (const nlohmann::json& layer : results[run]["layers"]) {
        if (layer["name"] != layer_name) {
          continue;
        }
        const double score = layer["crack_margin"].is_number()
                                 ? layer["crack_margin"].get<double>()
                                 : -layer["peak_strain"].get<double>();
        if (score > best_score) {
          best_score = score;
          best_run[layer_name] = run;
        }
      }
    }
  }
  // The cover can only be best where it exists.
  CHECK(best_run["cover"] != "uncovered");

  const nlohmann::json comparison = json_file(out / "comparison.json");
  CHECK(comparison["format"] == 1);
  REQUIRE(comparison["runs"].size() == runs.size());
  for (std::size_t i = 0; i < runs.size(); ++i) {
    CHECK(comparison["runs"][i]["name"] == runs[i]);
    CHECK(comparison["runs"][i]["completed"] == true);
  }
  CHECK(comparison["layers"] == nlohmann::json(layers));
  REQUIRE(comparison["rows"].size() == runs.size() * layers.size());
  int rows_checked = 0;
  for (const nlohmann::json& row : comparison["rows"]) {
    const std::string run = row["variant"];
    const std::string layer_name = row["layer"];
    INFO("row " << run << " / " << layer_name);
    const bool expected_present = !(run == "uncovered" && layer_name == "cover");
    CHECK(row["present"] == expected_present);
    CHECK(row["best"] == (best_run[layer_name] == run));
    if (!expected_present) {
      CHECK(row["peak_strain"].is_null());
      CHECK(row["verdict"].is_null());
      ++rows_checked;
      continue;
    }
    const nlohmann::json* layer = nullptr;
    for (const nlohmann::json& candidate : results[run]["layers"]) {
      if (candidate["name"] == layer_name) {
        layer = &candidate;
      }
    }
    REQUIRE(layer != nullptr);
    CHECK(row["peak_strain"].get<double>() == (*layer)["peak_strain"].get<double>());
    CHECK(row["concentration"] == (*layer)["concentration"]);
    CHECK(row["crack_margin"] == (*layer)["crack_margin"]);
    CHECK(row["verdict"] == (*layer)["verdict"]);
    ++rows_checked;
  }
  CHECK(rows_checked == 9);
  for (const std::string& layer_name : layers) {
    CHECK(comparison["best"][layer_name] == nlohmann::json::array({best_run[layer_name]}));
  }

  // comparison.csv: the documented header, one line per run and layer, an
  // absent layer with empty numbers and verdict `absent`.
  std::istringstream csv(read_text(out / "comparison.csv"));
  std::string line;
  REQUIRE(std::getline(csv, line));
  CHECK(line ==
        "variant,layer,peak_strain,concentration,crack_margin,verdict,best,completed,yield_margin,"
        "crack_onset_load_factor,yield_load_factor");
  int csv_rows = 0;
  while (std::getline(csv, line)) {
    ++csv_rows;
    if (line.rfind("uncovered,cover,", 0) == 0) {
      CHECK(line == "uncovered,cover,,,,absent,false,true,,,");
    }
    for (const std::string& layer_name : layers) {
      if (line.rfind(best_run[layer_name] + "," + layer_name + ",", 0) == 0) {
        CHECK(line.find(",true,true,") != std::string::npos);
      }
    }
  }
  CHECK(csv_rows == 9);

  // comparison.txt: every run named, and in each layer's block the best
  // run's line marked.
  const std::string text = read_text(out / "comparison.txt");
  for (const std::string& run : runs) {
    CHECK(text.find(run) != std::string::npos);
  }
  for (const std::string& layer_name : layers) {
    INFO("layer block " << layer_name);
    const std::size_t block = text.find("Layer " + layer_name + "\n");
    REQUIRE(block != std::string::npos);
    const std::size_t block_end = text.find("\nLayer ", block + 1);
    const std::string block_text = text.substr(block, block_end - block);
    std::istringstream block_lines(block_text);
    int marked = 0;
    while (std::getline(block_lines, line)) {
      if (line.find("<- best") != std::string::npos) {
        ++marked;
        CHECK(line.find("  " + best_run[layer_name] + " ") == 0);
      }
    }
    CHECK(marked == 1);
  }
  std::filesystem::remove_all(out);
}
