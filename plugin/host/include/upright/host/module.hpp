// Module: a controller module loaded from a shared object through the C ABI
// (upright/controller_abi.h) — its function table, checked for version and completeness — and
// where the built-in modules live.
#pragma once

#include <memory>
#include <string>
#include <vector>

#include "upright/base/result.hpp"
#include "upright/controller_abi.h"

namespace upright::host {

class Module {
 public:
  // Loads `path` (dlopen), calls its entry function (an exception escaping it is refused too) and
  // checks the ABI version, the table's size and every function. A failure names the file and
  // what is wrong.
  static Result<std::shared_ptr<Module>> Load(const std::string& path);
  ~Module();
  Module(const Module&) = delete;
  Module& operator=(const Module&) = delete;

  const upright_controller_api& api() const { return *api_; }
  const std::string& path() const { return path_; }
  std::string name() const { return api_->name ? api_->name : ""; }

 private:
  Module(void* handle, const upright_controller_api* api, std::string path);
  void* handle_;
  const upright_controller_api* api_;
  std::string path_;
};

// The built-in module names, and the file each loads from: the first of `search_dirs` holding
// "upright_<name>.so". DefaultModuleDirs() lists, in order: $UPRIGHT_MODULE_DIR, "modules" beside
// the running program, the installed module folder relative to it (../lib/upright/modules by
// default), and the build tree's module folder.
const std::vector<std::string>& BuiltinModuleNames();
std::vector<std::string> DefaultModuleDirs();
// The path of built-in `name`, or a failure listing where it looked.
Result<std::string> FindBuiltinModule(const std::string& name,
                                      const std::vector<std::string>& search_dirs);

}  // namespace upright::host
