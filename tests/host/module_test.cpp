// The module loader: a good module loads; each broken one is refused with a message that names
// the file and what is wrong; built-in lookup says where it looked.
#include "upright/host/module.hpp"

#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <string>

#include "succeeded.hpp"

namespace upright::host {
namespace {

std::string TestModule(const std::string& name) {
  return std::string(UPRIGHT_TEST_MODULE_DIR) + "/" + name + ".so";
}

// Loads a module that must be refused; returns the message.
std::string Refusal(const std::string& path) {
  const auto module = Module::Load(path);
  EXPECT_FALSE(module.has_value()) << path;
  return module ? std::string() : module.error();
}

TEST(ModuleLoader, LoadsAWellFormedModule) {
  const auto module = Module::Load(TestModule("faulty_0"));
  ASSERT_TRUE(Succeeded(module));
  EXPECT_EQ((*module)->name(), "faulty");
  EXPECT_EQ((*module)->api().abi_version, UPRIGHT_CONTROLLER_ABI_VERSION);
}

TEST(ModuleLoader, RejectsAWrongAbiVersionNamingBothVersions) {
  const std::string path = TestModule("faulty_3");
  const std::string error = Refusal(path);
  EXPECT_EQ(error.rfind(path + ": built for controller ABI version 99, this program speaks "
                               "version 1",
                        0),
            0u)
      << error;
}

TEST(ModuleLoader, RejectsAMissingEntrySymbol) {
  const std::string path = TestModule("no_entry");
  const std::string error = Refusal(path);
  EXPECT_EQ(error.rfind(path + ": no 'upright_controller_entry' symbol", 0), 0u) << error;
}

TEST(ModuleLoader, RefusesAModuleWhoseEntryThrowsInsteadOfEnding) {
  const std::string path = TestModule("throwing_entry");
  EXPECT_EQ(Refusal(path),
            path + ": upright_controller_entry threw an exception: no table for this build");
}

TEST(ModuleLoader, RejectsATableWithAMissingFunction) {
  const std::string path = TestModule("faulty_4");
  EXPECT_EQ(Refusal(path), path + ": its function table has no 'step'");
}

TEST(ModuleLoader, RejectsAMissingFileAndAFileThatIsNoSharedObject) {
  EXPECT_EQ(Refusal("/nonexistent/module.so"), "/nonexistent/module.so: no such controller module file");
  const std::string text_file = std::string(UPRIGHT_SOURCE_DIR) + "/README.md";
  const std::string error = Refusal(text_file);
  EXPECT_EQ(error.rfind(text_file + ": cannot load it as a shared object", 0), 0u) << error;
}

TEST(ModuleLoader, BuiltinLookupNamesTheFoldersItSearched) {
  const Result<std::string> missing = FindBuiltinModule("lqr", {"/nowhere/a", "/nowhere/b"});
  ASSERT_FALSE(missing.has_value());
  EXPECT_EQ(missing.error(),
            "built-in controller 'lqr' (upright_lqr.so) not found in: /nowhere/a, /nowhere/b");
  const Result<std::string> unknown = FindBuiltinModule("fuzzy", {"/nowhere"});
  ASSERT_FALSE(unknown.has_value());
  EXPECT_EQ(unknown.error(),
            "no built-in controller named 'fuzzy' (built-ins: lqr, hinf, lqg, pid)");
  // The first folder that holds the file is the one found.
  const std::filesystem::path holder =
      std::filesystem::path(::testing::TempDir()) / "builtin_lookup_holder";
  std::filesystem::create_directories(holder);
  std::ofstream(holder / "upright_lqr.so") << "";
  const Result<std::string> found =
      FindBuiltinModule("lqr", {"/nowhere/a", holder.string(), UPRIGHT_TEST_MODULE_DIR});
  ASSERT_TRUE(Succeeded(found));
  EXPECT_EQ(*found, holder.string() + "/upright_lqr.so");
  std::filesystem::remove_all(holder);
}

}  // namespace
}  // namespace upright::host
