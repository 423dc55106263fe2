// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Whole-file reads and safe file names.

#include <cstddef>
#include <string>
#include <string_view>

namespace trimwright::io {

/// The whole content of a file. Throws FileError "PATH: cannot read: REASON" when it cannot be
/// opened or read (missing, a directory, no permission).
std::string read_file(const std::string& path);

/// Longest stem sanitize_file_stem returns by default, bytes (leaves room for a suffix and for the
/// temporary names OutputSet uses within the usual 255-byte file-name limit).
inline constexpr std::size_t kMaxFileStemBytes = 80;

/// A safe file stem (a name without extension) made from free text such as a job's title.
/// Keeps ASCII letters, digits, '_', '-', '.', and printable non-ASCII UTF-8 letters; any run of
/// other characters (spaces, path separators '/' and '\\', punctuation, control characters,
/// invisible or direction-changing code points, invalid UTF-8) becomes one '-'. Leading and
/// trailing '.', '-' and '_' are removed, so the stem never starts with a dot and is never "." or
/// "..". Cut to at most `max_bytes` (≥ 1) at a character boundary. Names that Windows reserves
/// (CON, NUL, COM1, …) get a trailing '_'. Never empty: returns `fallback` (itself sanitised,
/// "trimwright" if that is empty too) when nothing usable is left.
std::string sanitize_file_stem(std::string_view text, std::string_view fallback = "trimwright",
                               std::size_t max_bytes = kMaxFileStemBytes);

/// True when `name` is a plain file name OutputSet may create: not empty, at most 200 bytes, no
/// '/', '\\' or control characters, not starting with '.'.
bool is_plain_file_name(std::string_view name);

}  // namespace trimwright::io
