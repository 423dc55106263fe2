// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// All-or-nothing writing of a command's output files into one folder (design.md §7: a failed
/// run leaves no partial file). The scheme is described in docs/file-formats.md.

#include <functional>
#include <string>
#include <string_view>
#include <vector>

namespace trimwright::io {

/// Write `bytes` to `path` atomically: a temporary file in the same folder, then renamed over
/// `path`, so readers see the old file or the whole new one. On failure the temporary is removed,
/// any old file at `path` is untouched, and FileError names the path and the OS reason. The
/// folder is created if missing (and removed again on failure). Unlike OutputSet, any file name
/// is accepted. `flush_to_disk` also fsyncs the file before the rename and the folder after it,
/// so that the new content survives a power cut (several ms per file).
void write_file_atomic(const std::string& path, std::string_view bytes, bool flush_to_disk = false);

/// A set of files to write into one folder, all or none.
///
/// Files are added by name (plain names, see is_plain_file_name) with their bytes or with a
/// function that writes a given path. commit() then:
///  1. creates the folder (and missing parents) if it does not exist;
///  2. refuses, before touching anything, a target name that exists and is not a regular file;
///  3. writes every file to a hidden temporary name in the folder (and, when asked, flushes it to
///     disk);
///  4. moves each existing target aside to a hidden backup name and renames the temporary onto it;
///  5. only when every file is in place, deletes the backups.
/// On any failure it removes its temporaries, puts the backups back, removes the folders it
/// created, and throws FileError naming the path and the OS reason: the folder is left as it was.
/// Files in the folder that are not in the set are never touched.
class OutputSet {
 public:
  /// Writes a file at the given (temporary) path; throws trimwright::Error on failure.
  using Writer = std::function<void(const std::string& path)>;

  /// An empty set for `folder` (relative or absolute; created by commit() if missing).
  /// `flush_to_disk`: fsync every file before the renames and the folder after them, so that a
  /// power cut right after commit() cannot leave empty files (costs several ms per file; the
  /// all-or-nothing behaviour on errors does not depend on it).
  explicit OutputSet(std::string folder, bool flush_to_disk = false);

  /// Add a file with its content. Throws InternalError for a name that is not plain or is
  /// already in the set (names come from the program, not the user: sanitise titles first).
  void add(const std::string& file_name, std::string bytes);

  /// Add a file written by `writer` to a temporary path during commit(). Same name rules as add().
  void add_writer(const std::string& file_name, Writer writer);

  /// The folder given at construction.
  const std::string& folder() const { return folder_; }

  /// Names added so far, in order.
  std::vector<std::string> file_names() const;

  /// Write everything (steps above). Returns the written paths (folder/name) in the order added.
  /// A set can be committed once; a second call throws InternalError.
  std::vector<std::string> commit();

 private:
  struct Entry {
    std::string name;
    std::string bytes;
    Writer writer;  ///< empty when `bytes` holds the content
  };
  std::string folder_;
  std::vector<Entry> entries_;
  bool flush_to_disk_ = false;
  bool committed_ = false;
};

}  // namespace trimwright::io
