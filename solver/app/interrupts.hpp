// SIGINT (Ctrl-C) and SIGTERM during a run: the first asks the run to stop
// after its current Newton iteration, keeping the last converged increment
// and writing the results so far; a second of either ends the process at
// once (the signal's default action).
#pragma once

#include <signal.h>

#include <string>

namespace plystrain::cli {

// Catches SIGINT and SIGTERM while it lives; restores the previous handlers
// when it goes.
class InterruptHandlers {
  struct sigaction previous_interrupt_ {};
  struct sigaction previous_terminate_ {};

 public:
  InterruptHandlers();
  ~InterruptHandlers();
  InterruptHandlers(const InterruptHandlers&) = delete;
  InterruptHandlers& operator=(const InterruptHandlers&) = delete;
};

// The name of the signal that asked the run to stop ("SIGINT", "SIGTERM"),
// or empty while none has.
[[nodiscard]] std::string stop_signal_name();

}  // namespace plystrain::cli
