// Exceptions thrown on OpenMP worker threads reach the calling thread.
#include "plystrain/solver/thread_exceptions.hpp"

#include <catch2/catch.hpp>

#include <atomic>
#include <stdexcept>
#include <string>

using plystrain::solver::ThreadExceptions;

TEST_CASE("an exception thrown inside a parallel loop is raised after it on the caller",
          "[threads]") {
  ThreadExceptions exceptions;
  std::atomic<int> completed{0};
  std::atomic<int> failed{0};
#pragma omp parallel for num_threads(2) schedule(static)
  for (int i = 0; i < 64; ++i) {
    const bool done = exceptions.capture([&] {
      if (i == 37) {
        throw std::runtime_error("cell " + std::to_string(i));
      }
    });
    (done ? completed : failed) += 1;
  }
  // Every other body ran; the one that threw is reported, not lost.
  CHECK(completed == 63);
  CHECK(failed == 1);
  CHECK_THROWS_WITH(exceptions.rethrow_first(), "cell 37");
}

TEST_CASE("without an exception nothing is raised after the loop", "[threads]") {
  ThreadExceptions exceptions;
#pragma omp parallel for num_threads(2) schedule(static)
  for (int i = 0; i < 16; ++i) {
    exceptions.capture([] {});
  }
  CHECK_NOTHROW(exceptions.rethrow_first());
}
