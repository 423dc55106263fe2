// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Internal to tw_io: in-memory zip archives through libzip, for the 3MF package.

#include <cstdint>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

namespace trimwright::io::detail {

/// One file inside a zip archive.
struct ZipEntry {
  std::string name;   ///< path inside the archive, '/'-separated, no leading '/'
  std::string bytes;  ///< uncompressed content
};

/// A zip archive of `entries`, in that order, deflated, every entry dated 1980-01-01 00:00 (DOS
/// time, no time zone), no extra fields: the same entries give the same bytes. Throws
/// InternalError if libzip fails (it only works in memory here).
std::string zip_bytes(const std::vector<ZipEntry>& entries);

/// Largest uncompressed entry read_zip_entry accepts, bytes (a guard against zip bombs).
inline constexpr std::uint64_t kMaxZipEntryBytes = std::uint64_t{1} << 30;

/// A zip archive opened for reading from bytes held by the caller (which must outlive it).
class ZipReader {
 public:
  /// Open `bytes` as a zip archive, checking its structure. Throws InputError "SOURCE: not a zip
  /// archive (…)" or naming the damage.
  ZipReader(std::string_view bytes, std::string source);
  ~ZipReader();
  ZipReader(const ZipReader&) = delete;
  ZipReader& operator=(const ZipReader&) = delete;

  /// Whether the archive holds `name` (exact, or ignoring ASCII case when `ignore_case`).
  bool contains(const std::string& name, bool ignore_case = false) const;

  /// The uncompressed content of entry `name` (matched like contains()), CRC checked. Throws
  /// InputError when it is missing, damaged or larger than kMaxZipEntryBytes.
  std::string read(const std::string& name, bool ignore_case = false) const;

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

}  // namespace trimwright::io::detail
