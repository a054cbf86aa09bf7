#include "upright/runner/common/sha256.hpp"

#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <string>

namespace upright::runner {
namespace {

// FIPS 180-2, Appendix B.1 (one-block message "abc").
TEST(Sha256, OneBlockMessageMatchesStandardExample) {
  EXPECT_EQ(Sha256Hex("abc"), "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
}

// FIPS 180-2, Appendix B.2 (multi-block message of 448 bits): its padding needs a second block.
TEST(Sha256, TwoBlockMessageMatchesStandardExample) {
  EXPECT_EQ(Sha256Hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq"),
            "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
}

// FIPS 180-2, Appendix B.3 (one million repetitions of 'a').
TEST(Sha256, MillionAMatchesStandardExample) {
  EXPECT_EQ(Sha256Hex(std::string(1000000, 'a')),
            "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0");
}

// The empty message: the widely published value (from memory), the same as coreutils'
// `sha256sum /dev/null` prints.
TEST(Sha256, EmptyMessage) {
  EXPECT_EQ(Sha256Hex(""), "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
}

// Lengths around the padding boundary (55 bytes fit one block with the length, 56 do not, 64 fill
// a block exactly). Check values computed with Python's hashlib.sha256 (OpenSSL), an independent
// implementation.
TEST(Sha256, PaddingBoundaryLengths) {
  EXPECT_EQ(Sha256Hex(std::string(55, 'a')),
            "9f4390f8d30c2dd92ec9f095b65e2b9ae9b0a925a5258e241c9f1e910f734318");
  EXPECT_EQ(Sha256Hex(std::string(56, 'a')),
            "b35439a4ac6f0948b6d6f9e3c6af0f5f590ce20f1bde7090ef7970686ec6738a");
  EXPECT_EQ(Sha256Hex(std::string(64, 'a')),
            "ffe054fe7ae0cb6dc65c3af9b61d5209f439851db43d0ba5997337df154668eb");
}

TEST(Sha256, FileDigestEqualsDigestOfItsBytes) {
  const std::filesystem::path dir = std::filesystem::temp_directory_path() /
                                    ("upright_sha256_test_" + std::to_string(::getpid()));
  std::filesystem::create_directories(dir);
  const std::string path = (dir / "million_a.txt").string();
  {
    std::ofstream file(path, std::ios::binary);
    file << std::string(1000000, 'a');  // larger than the reader's chunk: several reads
  }
  const Result<std::string> digest = Sha256OfFile(path);
  ASSERT_TRUE(digest) << digest.error();
  // FIPS 180-2, Appendix B.3, as above.
  EXPECT_EQ(*digest, "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0");
  std::filesystem::remove_all(dir);
}

TEST(Sha256, MissingFileGivesNoDigestAndNamesThePath) {
  const std::string path = "/nonexistent_upright_dir/scenario.xml";
  const Result<std::string> digest = Sha256OfFile(path);
  ASSERT_FALSE(digest);
  EXPECT_NE(digest.error().find("cannot read " + path), std::string::npos) << digest.error();
}

TEST(Sha256, FolderIsNotReadableAsAFile) {
  const Result<std::string> digest = Sha256OfFile(std::filesystem::temp_directory_path().string());
  ASSERT_FALSE(digest);
  EXPECT_NE(digest.error().find("cannot read"), std::string::npos) << digest.error();
}

}  // namespace
}  // namespace upright::runner
