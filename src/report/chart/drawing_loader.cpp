// The drawing back end of the plumb binary: the shared module plumb-drawing.so, loaded with dlopen() the first
// time a command draws, so that commands that draw nothing never load cairo, pango and what they pull in.
//
// Where it is looked for (never a path from the environment: a module is code): beside the binary (the build
// folder), then PLUMB_DRAWING_MODULE_DIR relative to the binary's folder (the installed layout, e.g.
// ../lib/x86_64-linux-gnu/plumb).
#include <dlfcn.h>
#include <fmt/format.h>

#include <filesystem>
#include <mutex>
#include <system_error>

#include "core/errors.hpp"
#include "report/chart/drawing_backend.hpp"

#ifndef PLUMB_DRAWING_MODULE_DIR
#define PLUMB_DRAWING_MODULE_DIR "../lib/plumb"
#endif

namespace plumb::report {
namespace {

constexpr const char* module_name = "plumb-drawing.so";

const DrawingBackend* load_backend() {
  std::error_code ec;
  const auto exe = std::filesystem::read_symlink("/proc/self/exe", ec);
  if (ec) throw StorageError(fmt::format("cannot find plumb's own folder to load {}: {}.", module_name, ec.message()));
  const auto folder = exe.parent_path();
  std::string tried, errors;
  for (const auto& candidate : {folder / module_name, folder / PLUMB_DRAWING_MODULE_DIR / module_name}) {
    tried += (tried.empty() ? "" : ", ") + candidate.lexically_normal().string();
    if (!std::filesystem::exists(candidate, ec)) continue;
    // RTLD_LOCAL: the module's own symbols stay its own; RTLD_NOW: a broken module fails here, not mid-drawing.
    void* handle = dlopen(candidate.c_str(), RTLD_NOW | RTLD_LOCAL);
    if (handle == nullptr) {
      errors += fmt::format(" ({})", dlerror());
      continue;
    }
    using Entry = const DrawingBackend* (*)();
    auto* entry = reinterpret_cast<Entry>(dlsym(handle, "plumb_drawing_backend_v1"));
    if (entry == nullptr) {
      errors += fmt::format(" ({} has no entry point plumb_drawing_backend_v1)", candidate.string());
      continue;
    }
    return entry();  // the module stays loaded for the life of the process
  }
  throw StorageError(
      fmt::format("cannot load plumb's drawing module (charts and PDF): tried {}{}; reinstall plumb.", tried, errors));
}

}  // namespace

const DrawingBackend& drawing_backend() {
  static const DrawingBackend* backend = nullptr;
  static std::once_flag once;
  std::call_once(once, [] { backend = load_backend(); });
  return *backend;
}

}  // namespace plumb::report
