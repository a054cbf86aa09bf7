#include "upright/host/module.hpp"

#include <dlfcn.h>
#include <unistd.h>

#include <algorithm>
#include <cstddef>
#include <cstdlib>
#include <filesystem>

#include "guarded_call.hpp"

namespace upright::host {
namespace {

// The table must reach at least to its last function, `destroy`, as version 1 defines it.
constexpr std::size_t kMinimumTableSize =
    offsetof(upright_controller_api, destroy) + sizeof(upright_controller_api::destroy);

std::string ExecutableDir() {
  std::error_code ec;
  const auto exe = std::filesystem::read_symlink("/proc/self/exe", ec);
  return ec ? std::string() : exe.parent_path().string();
}

}  // namespace

Module::Module(void* handle, const upright_controller_api* api, std::string path)
    : handle_(handle), api_(api), path_(std::move(path)) {}

Module::~Module() {
  if (handle_) dlclose(handle_);
}

Result<std::shared_ptr<Module>> Module::Load(const std::string& path) {
  auto fail = [&](const std::string& why, void* handle) -> Result<std::shared_ptr<Module>> {
    if (handle) dlclose(handle);
    return Failure(path + ": " + why);
  };
  if (!std::filesystem::exists(path)) return fail("no such controller module file", nullptr);
  // A path without a slash would make dlopen search the library path instead of this file.
  const std::string open_path = path.find('/') == std::string::npos ? "./" + path : path;
  void* handle = dlopen(open_path.c_str(), RTLD_NOW | RTLD_LOCAL);
  if (!handle) {
    const char* why = dlerror();
    return fail(std::string("cannot load it as a shared object: ") + (why ? why : "unknown"),
                nullptr);
  }
  void* symbol = dlsym(handle, UPRIGHT_CONTROLLER_ENTRY_SYMBOL);
  if (!symbol) {
    return fail(std::string("no '") + UPRIGHT_CONTROLLER_ENTRY_SYMBOL +
                    "' symbol: not an upright controller module (export it with "
                    "UPRIGHT_CONTROLLER_EXPORT)",
                handle);
  }
  const auto entry = reinterpret_cast<upright_controller_entry_fn>(symbol);
  const Result<const upright_controller_api*> table = internal::GuardedCall(entry);
  if (!table) {
    return fail(std::string(UPRIGHT_CONTROLLER_ENTRY_SYMBOL) + " " + table.error(), handle);
  }
  const upright_controller_api* api = *table;
  if (!api) return fail(std::string(UPRIGHT_CONTROLLER_ENTRY_SYMBOL) + " returned NULL", handle);
  if (api->abi_version != UPRIGHT_CONTROLLER_ABI_VERSION) {
    return fail("built for controller ABI version " + std::to_string(api->abi_version) +
                    ", this program speaks version " +
                    std::to_string(UPRIGHT_CONTROLLER_ABI_VERSION) + "; rebuild it against "
                    "this version's upright/controller_abi.h",
                handle);
  }
  if (api->struct_size < kMinimumTableSize) {
    return fail("its function table is " + std::to_string(api->struct_size) +
                    " bytes, version 1 needs at least " + std::to_string(kMinimumTableSize) +
                    " (set struct_size = sizeof(upright_controller_api))",
                handle);
  }
  const std::pair<const char*, bool> functions[] = {{"create", api->create != nullptr},
                                                     {"reset", api->reset != nullptr},
                                                     {"step", api->step != nullptr},
                                                     {"destroy", api->destroy != nullptr}};
  for (const auto& [name, present] : functions) {
    if (!present) return fail(std::string("its function table has no '") + name + "'", handle);
  }
  return std::shared_ptr<Module>(new Module(handle, api, path));
}

const std::vector<std::string>& BuiltinModuleNames() {
  static const std::vector<std::string> kNames = {"lqr", "hinf", "lqg", "pid"};
  return kNames;
}

std::vector<std::string> DefaultModuleDirs() {
  std::vector<std::string> dirs;
  if (const char* env = std::getenv("UPRIGHT_MODULE_DIR"); env && *env) dirs.emplace_back(env);
  const std::string exe_dir = ExecutableDir();
  if (!exe_dir.empty()) {
    dirs.push_back(exe_dir + "/modules");
    // Installed: bin/../lib/upright/modules, or wherever the install's libdir put them.
    dirs.push_back(
        (std::filesystem::path(exe_dir) / UPRIGHT_MODULE_DIR_FROM_BIN).lexically_normal().string());
  }
#ifdef UPRIGHT_BUILD_MODULE_DIR
  dirs.emplace_back(UPRIGHT_BUILD_MODULE_DIR);
#endif
  return dirs;
}

Result<std::string> FindBuiltinModule(const std::string& name,
                                      const std::vector<std::string>& dirs) {
  const auto& names = BuiltinModuleNames();
  if (std::find(names.begin(), names.end(), name) == names.end()) {
    return Failure("no built-in controller named '" + name + "' (built-ins: lqr, hinf, lqg, pid)");
  }
  const std::string file = "upright_" + name + ".so";
  std::string looked;
  for (const auto& dir : dirs) {
    const std::string candidate = dir + "/" + file;
    if (std::filesystem::exists(candidate)) return candidate;
    looked += (looked.empty() ? "" : ", ") + dir;
  }
  return Failure("built-in controller '" + name + "' (" + file + ") not found in: " + looked);
}

}  // namespace upright::host
