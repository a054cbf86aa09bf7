#include "upright/runner/atomic_file.hpp"

#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

namespace upright::runner {
namespace {

namespace fs = std::filesystem;

class AtomicFile : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = fs::temp_directory_path() / ("upright_atomic_file_test_" + std::to_string(::getpid()));
    fs::remove_all(dir_);
    fs::create_directories(dir_);
  }
  void TearDown() override { fs::remove_all(dir_); }

  static std::string Read(const fs::path& path) {
    std::ifstream file(path, std::ios::binary);
    std::stringstream text;
    text << file.rdbuf();
    return text.str();
  }
  // Entries of `dir_` whose name holds ".tmp.".
  int Temporaries() const {
    int count = 0;
    for (const auto& entry : fs::directory_iterator(dir_)) {
      if (entry.path().filename().string().find(".tmp.") != std::string::npos) ++count;
    }
    return count;
  }

  fs::path dir_;
};

TEST_F(AtomicFile, WritesTheBytesAndLeavesNoTemporary) {
  const fs::path path = dir_ / "table.csv";
  const std::string contents("a,b\n1,2\n\0tail", 13);  // embedded NUL: written as bytes
  std::string error;
  ASSERT_TRUE(WriteFileAtomically(path.string(), contents, &error)) << error;
  EXPECT_EQ(Read(path), contents);
  EXPECT_EQ(Temporaries(), 0);
}

TEST_F(AtomicFile, ReplacesAnExistingFileWhole) {
  const fs::path path = dir_ / "table.csv";
  std::string error;
  ASSERT_TRUE(WriteFileAtomically(path.string(), std::string(1000, 'x'), &error)) << error;
  ASSERT_TRUE(WriteFileAtomically(path.string(), "short\n", &error)) << error;
  EXPECT_EQ(Read(path), "short\n");
  EXPECT_EQ(Temporaries(), 0);
}

TEST_F(AtomicFile, MissingFolderFailsNamingThePath) {
  const std::string path = (dir_ / "no_such_folder" / "table.csv").string();
  std::string error;
  EXPECT_FALSE(WriteFileAtomically(path, "x", &error));
  EXPECT_NE(error.find("cannot write " + path + ": "), std::string::npos) << error;
}

TEST_F(AtomicFile, FailedRenameRemovesTheTemporary) {
  // A folder in the way: the temporary is written, the rename over a non-empty folder fails.
  const fs::path path = dir_ / "occupied";
  fs::create_directories(path / "inside");
  std::string error;
  EXPECT_FALSE(WriteFileAtomically(path.string(), "x", &error));
  EXPECT_NE(error.find("cannot write " + path.string() + ": "), std::string::npos) << error;
  EXPECT_EQ(Temporaries(), 0);
  EXPECT_TRUE(fs::is_directory(path));
}

}  // namespace
}  // namespace upright::runner
