// Hand-made results and a scratch directory shared by the writer tests.
#pragma once

#include "plystrain/solver/results.hpp"

#include <unistd.h>
#include <filesystem>
#include <string>

namespace plystrain::test {

// A directory of its own per test, removed afterwards.
class ScratchDirectory {
 public:
  explicit ScratchDirectory(const std::string& name)
      : path_(std::filesystem::temp_directory_path() /
              ("plystrain-io-" + name + "-" + std::to_string(::getpid()))) {
    std::filesystem::remove_all(path_);
    std::filesystem::create_directories(path_);
  }
  ~ScratchDirectory() {
    std::error_code ignored;
    std::filesystem::remove_all(path_, ignored);
  }
  ScratchDirectory(const ScratchDirectory&) = delete;
  ScratchDirectory& operator=(const ScratchDirectory&) = delete;

  [[nodiscard]] const std::filesystem::path& path() const { return path_; }

  // Every entry of the directory, for "nothing partial left behind" checks.
  [[nodiscard]] int entry_count() const {
    int count = 0;
    for ([[maybe_unused]] const auto& entry : std::filesystem::directory_iterator(path_)) {
      ++count;
    }
    return count;
  }

 private:
  std::filesystem::path path_;
};

// A layer with every optional given; lengths in micrometres.
inline LayerResult cracked_absorber() {
  LayerResult layer;
  layer.name = "absorber";
  layer.role = "active";
  layer.material = "demo-polymer";
  layer.basis = "invented for a test";
  layer.thickness = 0.12;
  layer.peak_strain = 0.1 + 0.2;  // 0.30000000000000004: needs 17 digits to survive
  layer.peak_at = {1000.0, 150.21};
  layer.raw_peak_strain = 0.45;
  layer.far_field_strain = 0.25;
  layer.concentration = layer.peak_strain / layer.far_field_strain;
  layer.min_strain = -0.11;
  layer.peak_stress = 31.5;
  layer.crack_onset_strain = 0.2;
  layer.yield_strain = 0.04;
  layer.crack_margin = 1.0 - layer.peak_strain / 0.2;
  layer.yield_margin = 1.0 - layer.peak_strain / 0.04;
  layer.crack_onset_load_factor = 0.55;  // within the load reached by sample_run (0.625)
  layer.yield_load_factor = 0.11;
  layer.verdict = judge(layer.peak_strain, layer.crack_onset_strain, layer.yield_strain);
  return layer;
}

// A layer with no limits and no far field: every optional absent.
inline LayerResult substrate_without_limits() {
  LayerResult layer;
  layer.name = "substrate";
  layer.role = "substrate";
  layer.material = "demo-elastomer";
  layer.basis = "invented for a test";
  layer.thickness = 150.0;
  layer.peak_strain = 0.05;
  layer.peak_at = {500.0, 0.0};
  layer.raw_peak_strain = 0.06;
  layer.far_field_strain = 0.0;
  layer.min_strain = -0.02;
  layer.peak_stress = 0.03;
  layer.verdict = judge(layer.peak_strain, std::nullopt, std::nullopt);
  return layer;
}

inline RunResults sample_run() {
  RunResults run;
  run.tool_version = "0.1.0";
  run.case_file = "sample.toml";
  run.case_hash = "0123456789abcdef";
  run.title = "Sample stack";
  run.shape = "strip";
  run.load = "stretch";
  run.lateral = "free";
  run.completed = false;
  run.load_reached = 0.625;
  run.message = "Newton did not converge after 6 cut-backs";
  run.layers = {substrate_without_limits(), cracked_absorber()};
  run.mesh = {1234, 300, 2468, 0.75};
  run.solver = {8, 31, 2, 1.5};
  run.cautions = {"A run-specific caution."};
  return run;
}

}  // namespace plystrain::test
