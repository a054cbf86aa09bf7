// The module loader: a good module loads; each broken one is refused with a message that names
// the file and what is wrong; built-in lookup says where it looked.
#include <gtest/gtest.h>

#include "upright/host/module.hpp"

namespace upright::host {
namespace {

std::string TestModule(const std::string& name) {
  return std::string(UPRIGHT_TEST_MODULE_DIR) + "/" + name + ".so";
}

// Loads a module that must be refused; returns the message.
std::string Refusal(const std::string& path) {
  std::string error;
  EXPECT_EQ(Module::Load(path, &error), nullptr) << path;
  return error;
}

TEST(ModuleLoader, LoadsAWellFormedModule) {
  std::string error;
  const auto module = Module::Load(TestModule("faulty_0"), &error);
  ASSERT_NE(module, nullptr) << error;
  EXPECT_EQ(module->name(), "faulty");
  EXPECT_EQ(module->api().abi_version, UPRIGHT_CONTROLLER_ABI_VERSION);
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
  std::string error;
  EXPECT_EQ(FindBuiltinModule("lqr", {"/nowhere/a", "/nowhere/b"}, &error), "");
  EXPECT_EQ(error, "built-in controller 'lqr' (upright_lqr.so) not found in: /nowhere/a, /nowhere/b");
  EXPECT_EQ(FindBuiltinModule("fuzzy", {"/nowhere"}, &error), "");
  EXPECT_EQ(error, "no built-in controller named 'fuzzy' (built-ins: lqr, hinf, lqg, pid)");
  // A folder that holds the file is found.
  EXPECT_EQ(FindBuiltinModule("lqr", {UPRIGHT_TEST_MODULE_DIR}, &error), "");
}

}  // namespace
}  // namespace upright::host
