// Running the plystrain executable from tests: exit code, stdout and stderr.
#pragma once

#include <sys/wait.h>

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

namespace plystrain::test {

struct CommandResult {
  int exit_code = -1;
  std::string out;
  std::string err;
};

inline std::string read_text(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

// Runs `plystrain <arguments>` with stdout and stderr captured in files;
// shell_setup (shell commands such as a ulimit) runs first, in the same shell.
inline CommandResult run_plystrain(const std::string& arguments, const std::string& shell_setup = "") {
  const std::filesystem::path scratch =
      std::filesystem::temp_directory_path() /
      ("plystrain-cli-" + std::to_string(::getpid()) + "-" +
       std::to_string(std::hash<std::string>{}(arguments)));
  std::filesystem::create_directories(scratch);
  const std::filesystem::path out = scratch / "out.txt";
  const std::filesystem::path err = scratch / "err.txt";
  const std::string command = shell_setup + std::string("'") + PLYSTRAIN_BINARY_PATH + "' " + arguments + " >'" +
                              out.string() + "' 2>'" + err.string() + "' </dev/null";
  const int status = std::system(command.c_str());
  CommandResult result;
  result.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  result.out = read_text(out);
  result.err = read_text(err);
  std::filesystem::remove_all(scratch);
  return result;
}

inline std::string data_path(const std::string& relative) {
  return std::string(PLYSTRAIN_TEST_DATA_DIR) + "/" + relative;
}

inline std::filesystem::path fresh_output_dir(const std::string& name) {
  const std::filesystem::path dir = std::filesystem::temp_directory_path() /
                                    ("plystrain-run-" + name + "-" + std::to_string(::getpid()));
  std::filesystem::remove_all(dir);
  return dir;
}

}  // namespace plystrain::test
