#include "upright/runner/common/atomic_file.hpp"

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
  const Status written = WriteFileAtomically(path.string(), contents);
  ASSERT_TRUE(written) << written.error();
  EXPECT_EQ(Read(path), contents);
  EXPECT_EQ(Temporaries(), 0);
}

TEST_F(AtomicFile, ReplacesAnExistingFileWhole) {
  const fs::path path = dir_ / "table.csv";
  const Status first = WriteFileAtomically(path.string(), std::string(1000, 'x'));
  ASSERT_TRUE(first) << first.error();
  const Status second = WriteFileAtomically(path.string(), "short\n");
  ASSERT_TRUE(second) << second.error();
  EXPECT_EQ(Read(path), "short\n");
  EXPECT_EQ(Temporaries(), 0);
}

TEST_F(AtomicFile, MissingFolderFailsNamingThePath) {
  const std::string path = (dir_ / "no_such_folder" / "table.csv").string();
  const Status written = WriteFileAtomically(path, "x");
  ASSERT_FALSE(written);
  EXPECT_NE(written.error().find("cannot write " + path + ": "), std::string::npos)
      << written.error();
}

TEST_F(AtomicFile, FailedRenameRemovesTheTemporary) {
  // A folder in the way: the temporary is written, the rename over a non-empty folder fails.
  const fs::path path = dir_ / "occupied";
  fs::create_directories(path / "inside");
  const Status written = WriteFileAtomically(path.string(), "x");
  ASSERT_FALSE(written);
  EXPECT_NE(written.error().find("cannot write " + path.string() + ": "), std::string::npos)
      << written.error();
  EXPECT_EQ(Temporaries(), 0);
  EXPECT_TRUE(fs::is_directory(path));
}

}  // namespace
}  // namespace upright::runner
