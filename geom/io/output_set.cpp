// SPDX-License-Identifier: GPL-3.0-or-later
// All-or-nothing output folders: temporaries, backups, renames, rollback.
#include "geom/io/output_set.hpp"

#include <fcntl.h>
#include <fmt/core.h>
#include <sys/stat.h>
#include <unistd.h>

#include <atomic>
#include <cerrno>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <utility>

#include "geom/base/error.hpp"
#include "geom/io/files.hpp"

namespace trimwright::io {
namespace {

namespace fs = std::filesystem;

[[noreturn]] void throw_os(const std::string& path, const char* action, int err) {
  throw FileError(fmt::format("{}: cannot {}: {}", path, action, std::strerror(err)));
}

std::string join(const std::string& folder, const std::string& name) {
  if (folder.empty()) return name;
  if (folder.back() == '/') return folder + name;
  return folder + "/" + name;
}

// A fresh hidden name beside `name` in `folder` that does not exist yet (checked by O_EXCL when
// the file is created). `tag` tells temporaries ("tmp") from backups ("old").
std::string hidden_name(const std::string& folder, const std::string& name, const char* tag) {
  static std::atomic<unsigned> counter{0};
  for (;;) {
    const std::string path =
        join(folder,
             fmt::format(".{}.{}-{}.tw-{}", name, static_cast<long>(::getpid()), counter++, tag));
    struct stat st;
    if (::lstat(path.c_str(), &st) != 0 && errno == ENOENT) return path;
  }
}

// Write all of `bytes` to a new file at `path` (which must not exist), flushed to disk if asked.
void write_new_file(const std::string& path, std::string_view bytes, const std::string& shown,
                    bool flush) {
  const int fd = ::open(path.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0666);
  if (fd < 0) throw_os(shown, "write", errno);
  std::size_t done = 0;
  while (done < bytes.size()) {
    const ssize_t n = ::write(fd, bytes.data() + done, bytes.size() - done);
    if (n < 0) {
      if (errno == EINTR) continue;
      const int err = errno;
      ::close(fd);
      throw_os(shown, "write", err);
    }
    done += static_cast<std::size_t>(n);
  }
  if (flush && ::fsync(fd) != 0) {
    const int err = errno;
    ::close(fd);
    throw_os(shown, "write", err);
  }
  if (::close(fd) != 0) throw_os(shown, "write", errno);
}

// Check that a writer produced a regular file at `path`, and flush it to disk if asked.
void check_written_file(const std::string& path, const std::string& shown, bool flush) {
  const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
  if (fd < 0) throw_os(shown, "write", errno);
  struct stat st;
  if (::fstat(fd, &st) != 0 || !S_ISREG(st.st_mode)) {
    ::close(fd);
    throw InternalError(fmt::format("{}: the writer did not produce a regular file", shown));
  }
  const int rc = flush ? ::fsync(fd) : 0;
  const int err = errno;
  ::close(fd);
  if (rc != 0) throw_os(shown, "write", err);
}

// Flush a folder's entries (the renames) to disk. Best effort: some file systems refuse it.
void sync_folder(const std::string& folder) {
  const int fd = ::open(folder.empty() ? "." : folder.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC);
  if (fd < 0) return;
  (void)::fsync(fd);
  ::close(fd);
}

// Creates `folder` and its missing parents; returns the folders created, outermost first.
std::vector<std::string> make_folder(const std::string& folder) {
  fs::path p = fs::path(folder).lexically_normal();
  if (p.has_filename() == false && p.has_parent_path()) p = p.parent_path();  // "out/" → "out"
  std::vector<fs::path> missing;
  for (fs::path q = p; !q.empty(); q = q.parent_path()) {
    struct stat st;
    if (::stat(q.c_str(), &st) == 0) {
      if (!S_ISDIR(st.st_mode)) {
        throw FileError(
            fmt::format("{}: cannot create the output folder: {} exists and is not a "
                        "folder",
                        folder, q.string()));
      }
      break;
    }
    if (errno != ENOENT) throw_os(q.string(), "create the output folder", errno);
    missing.push_back(q);
    if (q == q.parent_path()) break;
  }
  std::vector<std::string> created;
  for (auto it = missing.rbegin(); it != missing.rend(); ++it) {
    if (::mkdir(it->c_str(), 0777) != 0 && errno != EEXIST) {
      const int err = errno;
      for (auto c = created.rbegin(); c != created.rend(); ++c) ::rmdir(c->c_str());
      throw_os(it->string(), "create the output folder", err);
    }
    created.push_back(it->string());
  }
  return created;
}

void remove_created_folders(const std::vector<std::string>& created) {
  for (auto c = created.rbegin(); c != created.rend(); ++c) ::rmdir(c->c_str());
}

// One file's way through commit().
struct Step {
  std::string target;
  std::string temp;
  std::string backup;
  bool target_existed = false;
  bool backed_up = false;
  bool installed = false;
};

// Undo every step taken so far: new files out, old files back, temporaries removed.
void roll_back(std::vector<Step>& steps) {
  for (auto it = steps.rbegin(); it != steps.rend(); ++it) {
    if (it->installed) ::unlink(it->target.c_str());
    if (it->backed_up) ::rename(it->backup.c_str(), it->target.c_str());
    if (!it->temp.empty() && !it->installed) ::unlink(it->temp.c_str());
  }
}

}  // namespace

void write_file_atomic(const std::string& path, std::string_view bytes, bool flush_to_disk) {
  const fs::path p(path);
  const std::string folder = p.parent_path().string();
  const std::string name = p.filename().string();
  if (name.empty() || name == "." || name == "..") {
    throw FileError(fmt::format("{}: cannot write: not a file name", path));
  }
  const std::vector<std::string> created = make_folder(folder.empty() ? "." : folder);
  const std::string temp = hidden_name(folder, name, "tmp");
  try {
    write_new_file(temp, bytes, path, flush_to_disk);
    if (::rename(temp.c_str(), path.c_str()) != 0) throw_os(path, "write", errno);
  } catch (...) {
    ::unlink(temp.c_str());
    remove_created_folders(created);
    throw;
  }
  if (flush_to_disk) sync_folder(folder);
}

OutputSet::OutputSet(std::string folder, bool flush_to_disk)
    : folder_(std::move(folder)), flush_to_disk_(flush_to_disk) {
  if (folder_.empty()) folder_ = ".";
}

void OutputSet::add(const std::string& file_name, std::string bytes) {
  add_writer(file_name, nullptr);
  entries_.back().bytes = std::move(bytes);
}

void OutputSet::add_writer(const std::string& file_name, Writer writer) {
  if (!is_plain_file_name(file_name)) {
    throw InternalError(fmt::format("output file name '{}' is not a plain file name", file_name));
  }
  for (const Entry& e : entries_) {
    if (e.name == file_name) {
      throw InternalError(fmt::format("output file '{}' added twice", file_name));
    }
  }
  entries_.push_back(Entry{file_name, std::string(), std::move(writer)});
}

std::vector<std::string> OutputSet::file_names() const {
  std::vector<std::string> names;
  names.reserve(entries_.size());
  for (const Entry& e : entries_) names.push_back(e.name);
  return names;
}

std::vector<std::string> OutputSet::commit() {
  if (committed_) throw InternalError("an OutputSet was committed twice");
  committed_ = true;
  std::vector<Step> steps;
  steps.reserve(entries_.size());
  for (const Entry& e : entries_) {
    Step s;
    s.target = join(folder_, e.name);
    steps.push_back(std::move(s));
  }

  const std::vector<std::string> created = make_folder(folder_);
  try {
    // Refuse, before writing anything, to replace what is not a plain file of ours to replace.
    for (Step& s : steps) {
      struct stat st;
      if (::lstat(s.target.c_str(), &st) == 0) {
        if (!S_ISREG(st.st_mode)) {
          throw FileError(
              fmt::format("{}: cannot write: it exists and is not a regular file "
                          "(a folder or a link); left as it is",
                          s.target));
        }
        s.target_existed = true;
      } else if (errno != ENOENT) {
        throw_os(s.target, "write", errno);
      }
    }
    // Every file to its temporary name, on disk.
    for (std::size_t i = 0; i < entries_.size(); ++i) {
      Step& s = steps[i];
      s.temp = hidden_name(folder_, entries_[i].name, "tmp");
      if (entries_[i].writer) {
        entries_[i].writer(s.temp);
        check_written_file(s.temp, s.target, flush_to_disk_);
      } else {
        write_new_file(s.temp, entries_[i].bytes, s.target, flush_to_disk_);
      }
    }
    // Install: old file aside, new file in place.
    for (Step& s : steps) {
      if (s.target_existed) {
        s.backup = hidden_name(folder_, fs::path(s.target).filename().string(), "old");
        if (::rename(s.target.c_str(), s.backup.c_str()) != 0) throw_os(s.target, "replace", errno);
        s.backed_up = true;
      }
      if (::rename(s.temp.c_str(), s.target.c_str()) != 0) throw_os(s.target, "write", errno);
      s.installed = true;
    }
  } catch (...) {
    roll_back(steps);
    remove_created_folders(created);
    throw;
  }
  if (flush_to_disk_) sync_folder(folder_);
  std::vector<std::string> paths;
  paths.reserve(steps.size());
  for (const Step& s : steps) {
    if (s.backed_up) ::unlink(s.backup.c_str());
    paths.push_back(s.target);
  }
  return paths;
}

}  // namespace trimwright::io
