#include "plystrain/solver/atomic_file.hpp"
#include "plystrain/solver/results_writers.hpp"

#include <nlohmann/json.hpp>

#include <charconv>
#include <cmath>
#include <stdexcept>
#include <system_error>

namespace plystrain {

namespace {

// Keys keep the documented order so that the file reads like the contract.
using Json = nlohmann::ordered_json;

// JSON has no NaN or infinity: a value that failed to evaluate is null.
Json number(double value) {
  return std::isfinite(value) ? Json(value) : Json(nullptr);
}

Json optional_number(const std::optional<double>& value) {
  return value ? number(*value) : Json(nullptr);
}

Json length(double micrometres, const OutputUnit& unit) {
  return number(micrometres / unit.length_scale);
}

Json point(const std::array<double, 2>& micrometres, const OutputUnit& unit) {
  return Json::array({length(micrometres[0], unit), length(micrometres[1], unit)});
}

// "free" and "held" stay strings; an imposed lateral strain is a number.
Json lateral_value(const std::string& lateral) {
  if (lateral.empty()) {
    return nullptr;
  }
  double value = 0.0;
  const char* end = lateral.data() + lateral.size();
  const auto [stop, error] = std::from_chars(lateral.data(), end, value);
  if (error == std::errc() && stop == end) {
    return number(value);
  }
  return lateral;
}

Json layer_json(const LayerResult& layer, const OutputUnit& unit) {
  Json out;
  out["name"] = layer.name;
  out["role"] = layer.role;
  out["material"] = layer.material;
  out["basis"] = layer.basis;
  out["thickness"] = length(layer.thickness, unit);
  out["peak_strain"] = number(layer.peak_strain);
  out["peak_at"] = point(layer.peak_at, unit);
  out["raw_peak_strain"] = number(layer.raw_peak_strain);
  out["far_field_strain"] = number(layer.far_field_strain);
  out["concentration"] = optional_number(layer.concentration);
  out["strain_at_cell_edge"] = optional_number(layer.strain_at_cell_edge);
  out["min_strain"] = number(layer.min_strain);
  out["peak_stress"] = number(layer.peak_stress);
  out["crack_onset_strain"] = optional_number(layer.crack_onset_strain);
  out["yield_strain"] = optional_number(layer.yield_strain);
  out["crack_margin"] = optional_number(layer.crack_margin);
  out["yield_margin"] = optional_number(layer.yield_margin);
  out["crack_onset_load_factor"] = optional_number(layer.crack_onset_load_factor);
  out["yield_load_factor"] = optional_number(layer.yield_load_factor);
  out["verdict"] = verdict_name(layer.verdict);
  out["raw_peak_verdict"] = verdict_name(layer.raw_peak_verdict);
  return out;
}

Json layers_json(const std::vector<LayerResult>& layers, const OutputUnit& unit) {
  Json out = Json::array();
  for (const LayerResult& layer : layers) {
    out.push_back(layer_json(layer, unit));
  }
  return out;
}

Json local_json(const LocalCheck& check, const OutputUnit& unit) {
  Json out;
  out["defect"] = check.defect_index;
  out["applied"] = Json{{"major", number(check.applied_major)},
                        {"minor", number(check.applied_minor)},
                        {"at", point(check.applied_at, unit)}};
  out["layers"] = layers_json(check.layers, unit);
  return out;
}

Json conform_json(const ConformResult& conform, const OutputUnit& unit) {
  Json out;
  out["surface"] = conform.surface;
  out["method"] = conform.method;
  Json required = Json::object();
  for (const RequiredStrain& entry : conform.required_strain) {
    required[entry.layer] =
        Json{{"max", number(entry.max)}, {"at", point(entry.at, unit)}, {"min", number(entry.min)}};
  }
  out["required_strain"] = required;
  out["contact_fraction"] = number(conform.contact_fraction);
  out["max_penetration"] = length(conform.max_penetration, unit);
  return out;
}

}  // namespace

std::string results_json_text(const RunResults& run, const OutputUnit& unit) {
  if (!(unit.length_scale > 0.0) || !std::isfinite(unit.length_scale)) {
    throw std::invalid_argument("results.json: the length scale must be positive and finite");
  }
  Json out;
  out["format"] = run.format;
  out["tool_version"] = run.tool_version;
  out["case"] = run.case_file;
  out["case_hash"] = run.case_hash;
  out["title"] = run.title;
  out["headline"] = headline(run);
  out["verdict"] = verdict_name(overall_verdict(run));
  out["units"] = unit.name;
  out["model"] =
      Json{{"shape", run.shape}, {"load", run.load}, {"lateral", lateral_value(run.lateral)}};
  out["completed"] = run.completed;
  out["load_reached"] = number(run.load_reached);
  out["message"] = run.message;
  out["interrupted_by"] = run.interrupted_by.empty() ? Json(nullptr) : Json(run.interrupted_by);
  out["layers"] = layers_json(run.layers, unit);
  Json local = Json::array();
  for (const LocalCheck& check : run.local) {
    local.push_back(local_json(check, unit));
  }
  out["local"] = local;
  out["conform"] = run.conform ? conform_json(*run.conform, unit) : Json(nullptr);
  out["cell"] = Json{{"width", length(run.cell.width, unit)},
                     {"width_basis", run.cell.width_basis},
                     {"evaluated_extent", length(run.cell.evaluated_extent, unit)},
                     {"edge_disturbance", optional_number(run.cell.edge_disturbance)}};
  Json defects = Json::array();
  for (const DefectZone& zone : run.defects) {
    defects.push_back(Json{{"defect", zone.index},
                           {"kind", zone.kind},
                           {"zone_of_influence", length(zone.zone_of_influence, unit)},
                           {"covered", zone.covered}});
  }
  out["defects"] = defects;
  if (run.verification) {
    Json reruns = Json::array();
    for (const ConvergenceRerun& rerun : run.verification->reruns) {
      Json layers = Json::object();
      for (const PeakChange& change : rerun.layers) {
        layers[change.layer] = Json{{"peak_strain", number(change.peak)},
                                    {"rerun_peak_strain", number(change.rerun_peak)},
                                    {"change", number(change.change)}};
      }
      reruns.push_back(Json{{"what", rerun.what},
                            {"folder", rerun.folder},
                            {"completed", rerun.completed},
                            {"largest_change", number(rerun.largest_change)},
                            {"layers", layers}});
    }
    out["verification"] = Json{{"tolerance", number(run.verification->tolerance)},
                               {"converged", run.verification->converged},
                               {"verdict", run.verification->verdict},
                               {"reruns", reruns}};
  } else {
    out["verification"] = nullptr;
  }
  Json overall = Json::object();
  for (const LayerResult& layer : governing_layers(run)) {
    overall[layer.name] = verdict_name(layer.verdict);
  }
  out["overall_verdicts"] = overall;
  out["mesh"] = Json{{"nodes", run.mesh.nodes},
                     {"elements", run.mesh.elements},
                     {"unknowns", run.mesh.unknowns},
                     {"min_quality", number(run.mesh.min_quality)}};
  out["solver"] = Json{{"increments", run.solver.increments},
                       {"newton_iterations", run.solver.newton_iterations},
                       {"cutbacks", run.solver.cutbacks},
                       {"seconds", number(run.solver.seconds)}};
  out["cautions"] = cautions_to_report(run);
  // Names come from user files and may hold any bytes: replace invalid UTF-8
  // rather than refuse to write the results of a finished run.
  return out.dump(2, ' ', false, Json::error_handler_t::replace) + "\n";
}

void write_results_json(const std::filesystem::path& path, const RunResults& run,
                        const OutputUnit& unit) {
  write_file_atomically(path, results_json_text(run, unit));
}

}  // namespace plystrain
