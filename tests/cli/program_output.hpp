// What the command-line tests share: a shell command's exit code and stdout, a scratch folder per
// test process, and a file's bytes.
#pragma once

#include <sys/wait.h>
#include <unistd.h>

#include <array>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

namespace upright::test {

struct ProgramOutput {
  int exit_code = -1;  // -1 when the command did not start or exit normally
  std::string output;  // stdout (and stderr where the command sends it there)
};

// Runs `command` through the shell and collects its stdout and exit code.
inline ProgramOutput RunShell(const std::string& command) {
  ProgramOutput r;
  FILE* pipe = popen(command.c_str(), "r");
  if (pipe == nullptr) return r;
  std::array<char, 4096> buffer;
  for (std::size_t n; (n = fread(buffer.data(), 1, buffer.size(), pipe)) > 0;) {
    r.output.append(buffer.data(), n);
  }
  const int status = pclose(pipe);
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  return r;
}

// An empty folder `name` under "<temp>/<group>_<pid>/".
inline std::filesystem::path ScratchFolder(const std::string& group, const std::string& name) {
  const std::filesystem::path dir =
      std::filesystem::temp_directory_path() / (group + "_" + std::to_string(getpid())) / name;
  std::filesystem::remove_all(dir);
  std::filesystem::create_directories(dir);
  return dir;
}

// The file's bytes ("" when it cannot be read).
inline std::string ReadBytes(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

}  // namespace upright::test
