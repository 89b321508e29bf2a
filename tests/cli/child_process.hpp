// The plystrain executable as a child process whose output the test reads
// as it comes, so that it can send the child a signal at a chosen moment.
#pragma once

#include <fcntl.h>
#include <poll.h>
#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <chrono>
#include <stdexcept>
#include <string>
#include <vector>

namespace plystrain::test {

class ChildRun {
 public:
  // Starts `plystrain <arguments...>`; stdout comes through a pipe, stderr
  // goes to `error_file`.
  ChildRun(const std::vector<std::string>& arguments, const std::string& error_file) {
    int pipe_ends[2];
    if (::pipe(pipe_ends) != 0) {
      throw std::runtime_error("cannot create a pipe");
    }
    pid_ = ::fork();
    if (pid_ < 0) {
      throw std::runtime_error("cannot fork");
    }
    if (pid_ == 0) {
      run_child(arguments, error_file, pipe_ends);
    }
    ::close(pipe_ends[1]);
    output_fd_ = pipe_ends[0];
  }
  ~ChildRun() {
    if (pid_ > 0 && !finished_) {
      ::kill(pid_, SIGKILL);
      ::waitpid(pid_, nullptr, 0);
    }
    if (output_fd_ >= 0) {
      ::close(output_fd_);
    }
  }
  ChildRun(const ChildRun&) = delete;
  ChildRun& operator=(const ChildRun&) = delete;

  [[nodiscard]] pid_t pid() const { return pid_; }
  [[nodiscard]] const std::string& output() const { return output_; }

  // Reads the child's output until it holds `text`; false at the end of the
  // output or after `limit`.
  bool wait_for(const std::string& text, std::chrono::seconds limit) {
    const auto deadline = std::chrono::steady_clock::now() + limit;
    while (output_.find(text) == std::string::npos) {
      const auto left = std::chrono::duration_cast<std::chrono::milliseconds>(
          deadline - std::chrono::steady_clock::now());
      if (left.count() <= 0 || !read_some(static_cast<int>(left.count()))) {
        return false;
      }
    }
    return true;
  }

  void send(int signal) const { ::kill(pid_, signal); }

  // Reads the rest of the output and waits for the child; its exit code,
  // or -1 when a signal ended it (the signal in `ending_signal`).
  int finish() {
    while (read_some(-1)) {
    }
    int status = 0;
    ::waitpid(pid_, &status, 0);
    finished_ = true;
    if (WIFSIGNALED(status)) {
      ending_signal_ = WTERMSIG(status);
      return -1;
    }
    return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  }
  [[nodiscard]] int ending_signal() const { return ending_signal_; }

 private:
  [[noreturn]] static void run_child(const std::vector<std::string>& arguments,
                                     const std::string& error_file, const int pipe_ends[2]) {
    ::close(pipe_ends[0]);
    // As a shell starts a command in the foreground, whatever the test
    // runner ignores.
    ::signal(SIGINT, SIG_DFL);
    ::signal(SIGTERM, SIG_DFL);
    ::dup2(pipe_ends[1], STDOUT_FILENO);
    const int error_fd = ::open(error_file.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
    ::dup2(error_fd, STDERR_FILENO);
    const int null_fd = ::open("/dev/null", O_RDONLY);
    ::dup2(null_fd, STDIN_FILENO);
    std::vector<std::string> words = {PLYSTRAIN_BINARY_PATH};
    words.insert(words.end(), arguments.begin(), arguments.end());
    std::vector<char*> argv;
    for (std::string& word : words) {
      argv.push_back(word.data());
    }
    argv.push_back(nullptr);
    ::execv(argv[0], argv.data());
    ::_exit(127);
  }

  // One read of whatever is there, waiting up to `milliseconds` (-1: no
  // limit); false at the end of the output or on a timeout.
  bool read_some(int milliseconds) {
    pollfd request{output_fd_, POLLIN, 0};
    if (::poll(&request, 1, milliseconds) <= 0) {
      return false;
    }
    char buffer[4096];
    const ssize_t count = ::read(output_fd_, buffer, sizeof buffer);
    if (count <= 0) {
      return false;
    }
    output_.append(buffer, static_cast<std::size_t>(count));
    return true;
  }

  pid_t pid_ = -1;
  int output_fd_ = -1;
  bool finished_ = false;
  int ending_signal_ = 0;
  std::string output_;
};

}  // namespace plystrain::test
