#include "plystrain/solver/atomic_file.hpp"
#include "plystrain/solver/results_writers.hpp"

#include <array>
#include <charconv>
#include <cmath>
#include <stdexcept>

namespace plystrain {

std::string round_trip_number(double value) {
  // std::to_chars without a precision gives the shortest form that parses
  // back to the same double.
  std::array<char, 64> buffer{};
  const auto [end, error] = std::to_chars(buffer.data(), buffer.data() + buffer.size(), value);
  if (error != std::errc()) {
    throw std::runtime_error("cannot format a number");
  }
  return std::string(buffer.data(), end);
}

std::string csv_field(const std::string& text) {
  if (text.find_first_of(",\"\r\n") == std::string::npos) {
    return text;
  }
  std::string quoted = "\"";
  for (const char c : text) {
    if (c == '"') {
      quoted += '"';
    }
    quoted += c;
  }
  quoted += '"';
  return quoted;
}

std::string profiles_csv_text(const std::vector<ProfileSample>& samples, const OutputUnit& unit) {
  if (!(unit.length_scale > 0.0) || !std::isfinite(unit.length_scale)) {
    throw std::invalid_argument("profiles.csv: the length scale must be positive and finite");
  }
  std::string out = "layer,x,z,strain_along,strain_across,strain_third,max_principal\n";
  for (const ProfileSample& sample : samples) {
    out += csv_field(sample.layer);
    for (const double value :
         {sample.x / unit.length_scale, sample.z / unit.length_scale, sample.strain_along,
          sample.strain_across, sample.strain_third, sample.max_principal}) {
      out += ',';
      out += round_trip_number(value);
    }
    out += '\n';
  }
  return out;
}

void write_profiles_csv(const std::filesystem::path& path,
                        const std::vector<ProfileSample>& samples, const OutputUnit& unit) {
  write_file_atomically(path, profiles_csv_text(samples, unit));
}

}  // namespace plystrain
