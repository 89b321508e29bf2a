#include "interrupts.hpp"

#include <unistd.h>

#include <csignal>

namespace plystrain::cli {

namespace {

// The one piece of process-wide mutable state: set by the handler, read
// through stop_signal_name().
volatile std::sig_atomic_t stop_signal = 0;

void restore_default(int signal) {
  struct sigaction action {};
  action.sa_handler = SIG_DFL;
  sigemptyset(&action.sa_mask);
  sigaction(signal, &action, nullptr);
}

// Async-signal-safe only: a flag, write(2) and sigaction(2).
extern "C" void on_stop_signal(int signal) {
  stop_signal = signal;
  restore_default(SIGINT);
  restore_default(SIGTERM);
  constexpr char notice[] =
      "\nplystrain: stopping after the current iteration and writing the results so far "
      "(a second Ctrl-C or SIGTERM stops at once)\n";
  const ssize_t ignored = ::write(STDERR_FILENO, notice, sizeof notice - 1);
  static_cast<void>(ignored);
}

// Catches `signal` unless it was ignored when the program started (a job a
// shell script put in the background ignores Ctrl-C, and stays so).
void catch_unless_ignored(int signal, struct sigaction& previous) {
  sigaction(signal, nullptr, &previous);
  if (previous.sa_handler == SIG_IGN) {
    return;
  }
  struct sigaction action {};
  action.sa_handler = on_stop_signal;
  sigemptyset(&action.sa_mask);
  action.sa_flags = SA_RESTART;
  sigaction(signal, &action, nullptr);
}

}  // namespace

InterruptHandlers::InterruptHandlers() {
  stop_signal = 0;
  catch_unless_ignored(SIGINT, previous_interrupt_);
  catch_unless_ignored(SIGTERM, previous_terminate_);
}

InterruptHandlers::~InterruptHandlers() {
  sigaction(SIGINT, &previous_interrupt_, nullptr);
  sigaction(SIGTERM, &previous_terminate_, nullptr);
}

std::string stop_signal_name() {
  switch (stop_signal) {
    case SIGINT:
      return "SIGINT";
    case SIGTERM:
      return "SIGTERM";
    default:
      return {};
  }
}

}  // namespace plystrain::cli
