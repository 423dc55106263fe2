// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Scratch folders for tests, snapshots of folder contents, small file helpers.

#include <unistd.h>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <map>
#include <stdexcept>
#include <string>
#include <system_error>

namespace trimwright::test {

/// A fresh empty folder under the build tree (or /tmp), removed with its content at scope end.
/// Set TRIMWRIGHT_KEEP_TEST_FILES=1 to keep it for inspection.
class TempDir {
 public:
  TempDir() {
#ifdef TRIMWRIGHT_BINARY_DIR
    const std::filesystem::path base = std::filesystem::path(TRIMWRIGHT_BINARY_DIR) / "test-tmp";
#else
    const std::filesystem::path base = std::filesystem::temp_directory_path();
#endif
    std::filesystem::create_directories(base);
    std::string templ = (base / "tw-XXXXXX").string();
    if (!::mkdtemp(templ.data())) throw std::runtime_error("mkdtemp failed in " + base.string());
    path_ = templ;
  }
  ~TempDir() {
    const char* keep = std::getenv("TRIMWRIGHT_KEEP_TEST_FILES");
    if (keep && *keep == '1') return;
    std::error_code ec;
    std::filesystem::permissions(path_, std::filesystem::perms::owner_all,
                                 std::filesystem::perm_options::add, ec);
    std::filesystem::remove_all(path_, ec);
  }
  TempDir(const TempDir&) = delete;
  TempDir& operator=(const TempDir&) = delete;

  /// The folder.
  const std::string& path() const { return path_; }
  /// A path inside the folder.
  std::string file(const std::string& name) const { return path_ + "/" + name; }

 private:
  std::string path_;
};

/// Write bytes to a file (test setup; throws std::runtime_error on failure).
inline void write_bytes(const std::string& path, const std::string& bytes) {
  std::ofstream f(path, std::ios::binary | std::ios::trunc);
  f.write(bytes.data(), static_cast<std::streamsize>(bytes.size()));
  if (!f) throw std::runtime_error("cannot write " + path);
}

/// Read a whole file (test check; throws std::runtime_error on failure).
inline std::string read_bytes(const std::string& path) {
  std::ifstream f(path, std::ios::binary);
  if (!f) throw std::runtime_error("cannot read " + path);
  return std::string(std::istreambuf_iterator<char>(f), std::istreambuf_iterator<char>());
}

/// Everything in a folder, recursively: relative path → content ("<dir>" for folders,
/// "<link>" for symbolic links). Two equal snapshots mean the folder was left exactly as it was.
inline std::map<std::string, std::string> folder_snapshot(const std::string& folder) {
  namespace fs = std::filesystem;
  std::map<std::string, std::string> out;
  for (const auto& e : fs::recursive_directory_iterator(folder)) {
    const std::string rel = fs::relative(e.path(), folder).string();
    if (e.is_symlink()) {
      out[rel] = "<link>";
    } else if (e.is_directory()) {
      out[rel] = "<dir>";
    } else {
      out[rel] = read_bytes(e.path().string());
    }
  }
  return out;
}

}  // namespace trimwright::test
