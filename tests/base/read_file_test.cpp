// Reading a file the user named: its bytes when it is a regular file within the limit, the limit
// itself accepted and one byte beyond refused, and a device, a FIFO (without blocking on it) or a
// folder refused by what it is.
#include "upright/base/read_file.hpp"

#include <gtest/gtest.h>
#include <sys/stat.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <string>

namespace upright {
namespace {

namespace fs = std::filesystem;

fs::path Scratch(const std::string& name) {
  const fs::path dir =
      fs::temp_directory_path() / ("upright_read_file_" + std::to_string(::getpid()));
  fs::create_directories(dir);
  const fs::path path = dir / name;
  fs::remove(path);
  return path;
}

TEST(ReadRegularFile, ReadsARegularFileUpToItsLimit) {
  const fs::path path = Scratch("small.xml");
  std::ofstream(path, std::ios::binary) << "<a/>\n";
  const Result<std::string> read = ReadRegularFile(path.string(), 5);
  ASSERT_TRUE(read) << read.error();
  EXPECT_EQ(*read, "<a/>\n");  // exactly at the limit
  const Result<std::string> over = ReadRegularFile(path.string(), 4);
  ASSERT_FALSE(over);
  EXPECT_EQ(over.error(), "the file is 5 bytes, more than the limit of 4");
  const fs::path empty = Scratch("empty.xml");
  std::ofstream(empty).flush();
  const Result<std::string> nothing = ReadRegularFile(empty.string(), 0);
  ASSERT_TRUE(nothing) << nothing.error();
  EXPECT_TRUE(nothing->empty());
}

TEST(ReadRegularFile, HoldsTheInputLimitOnALargeFile) {
  // A sparse file one byte over the 16 MiB input limit, and one exactly at it.
  const fs::path path = Scratch("large.xml");
  std::ofstream(path).flush();
  fs::resize_file(path, kMaxInputFileBytes + 1);
  const Result<std::string> over = ReadRegularFile(path.string(), kMaxInputFileBytes);
  ASSERT_FALSE(over);
  EXPECT_EQ(over.error(), "the file is 16777217 bytes, more than the limit of 16777216");
  fs::resize_file(path, kMaxInputFileBytes);
  const Result<std::string> at = ReadRegularFile(path.string(), kMaxInputFileBytes);
  ASSERT_TRUE(at) << at.error();
  EXPECT_EQ(at->size(), kMaxInputFileBytes);
  fs::remove(path);
}

TEST(ReadRegularFile, RefusesWhatIsNotARegularFile) {
  const Result<std::string> device = ReadRegularFile("/dev/zero", kMaxInputFileBytes);
  ASSERT_FALSE(device);
  EXPECT_EQ(device.error(), "not a regular file (a character device)");
  // A FIFO nobody writes to: opening it to read would wait forever.
  const fs::path fifo = Scratch("fifo.xml");
  ASSERT_EQ(::mkfifo(fifo.c_str(), 0600), 0);
  const Result<std::string> pipe = ReadRegularFile(fifo.string(), kMaxInputFileBytes);
  ASSERT_FALSE(pipe);
  EXPECT_EQ(pipe.error(), "not a regular file (a FIFO)");
  fs::remove(fifo);
  const Result<std::string> folder =
      ReadRegularFile(fs::temp_directory_path().string(), kMaxInputFileBytes);
  ASSERT_FALSE(folder);
  EXPECT_EQ(folder.error(), "not a regular file (a folder)");
  const Result<std::string> missing = ReadRegularFile("/no/such/file.xml", kMaxInputFileBytes);
  ASSERT_FALSE(missing);
  EXPECT_EQ(missing.error(), "cannot open file: No such file or directory");
}

}  // namespace
}  // namespace upright
