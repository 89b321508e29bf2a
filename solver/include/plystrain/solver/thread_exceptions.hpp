// An exception must not leave an OpenMP parallel region: the runtime ends the
// process there (std::terminate). Loop bodies inside a region run through
// ThreadExceptions::capture, which keeps the first exception of any thread
// as a value; after the region the calling thread raises it again, where the
// load stepper (or the command line) can catch it.
#pragma once

#include <exception>

namespace plystrain::solver {

class ThreadExceptions {
 public:
  // Runs `body`; returns false when it threw (the exception is kept).
  template <class Body>
  bool capture(Body&& body) noexcept {
    try {
      body();
      return true;
    } catch (...) {
      keep(std::current_exception());
      return false;
    }
  }

  // After the parallel region: rethrows the first exception kept, if any.
  void rethrow_first() const {
    if (first_) {
      std::rethrow_exception(first_);
    }
  }

 private:
  void keep(std::exception_ptr error) noexcept {
#pragma omp critical(plystrain_thread_exceptions)
    {
      if (!first_) {
        first_ = std::move(error);
      }
    }
  }

  std::exception_ptr first_;
};

}  // namespace plystrain::solver
