// Wall time since a start, for the timings the iteration records carry.
#pragma once

#include <chrono>

namespace plystrain::nonlinear::detail {

class Stopwatch {
 public:
  Stopwatch() : start_(std::chrono::steady_clock::now()) {}
  [[nodiscard]] double seconds() const {
    return std::chrono::duration<double>(std::chrono::steady_clock::now() - start_).count();
  }

 private:
  std::chrono::steady_clock::time_point start_;
};

}  // namespace plystrain::nonlinear::detail
