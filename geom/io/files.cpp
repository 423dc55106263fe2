// SPDX-License-Identifier: GPL-3.0-or-later
// Whole-file reads and file-name sanitising.
#include "geom/io/files.hpp"

#include <fcntl.h>
#include <fmt/core.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <vector>

#include "geom/base/error.hpp"
#include "geom/io/text_util.hpp"

namespace trimwright::io {
namespace {

std::string os_reason(int err) { return std::strerror(err); }

using detail::CodePoint;
using detail::decode_utf8;

// Non-ASCII code points kept in file names: printable letters and symbols. Excluded: C1 controls,
// no-break and other spaces, soft hyphen, the General Punctuation block (zero-width characters,
// direction overrides, line separators), slash and backslash look-alikes, variation selectors,
// the byte-order mark, specials, private use and tag characters.
bool keep_non_ascii(char32_t cp) {
  if (cp < 0xA1 || cp == 0xAD) return false;
  if (cp == 0x1680 || cp == 0x180E || cp == 0x3000) return false;
  if (cp >= 0x2000 && cp <= 0x206F) return false;
  if (cp == 0x2215 || cp == 0x29F5 || cp == 0x29F8 || cp == 0x29F9) return false;
  if (cp == 0xFF0F || cp == 0xFF3C) return false;
  if (cp >= 0xFE00 && cp <= 0xFE0F) return false;
  if (cp == 0xFEFF || (cp >= 0xFFF0 && cp <= 0xFFFF)) return false;
  if (cp >= 0xE000 && cp <= 0xF8FF) return false;
  if (cp >= 0xE0000) return false;  // tags, variation selectors supplement, private use planes
  return true;
}

bool keep_ascii(char c) {
  return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') || c == '_' ||
         c == '-' || c == '.';
}

bool is_trim_char(char c) { return c == '.' || c == '-' || c == '_'; }

char ascii_upper(char c) { return (c >= 'a' && c <= 'z') ? static_cast<char>(c - 'a' + 'A') : c; }

// CON, PRN, AUX, NUL, COM1–COM9, LPT1–LPT9: names Windows cannot create, with any extension.
bool is_windows_reserved(std::string_view stem) {
  const std::string_view base = stem.substr(0, stem.find('.'));
  std::string up;
  for (char c : base) up.push_back(ascii_upper(c));
  if (up == "CON" || up == "PRN" || up == "AUX" || up == "NUL") return true;
  return up.size() == 4 && (up.compare(0, 3, "COM") == 0 || up.compare(0, 3, "LPT") == 0) &&
         up[3] >= '1' && up[3] <= '9';
}

std::string sanitize_once(std::string_view text, std::size_t max_bytes) {
  std::string out;
  // Byte offsets in `out` where a character ends, to cut at a boundary.
  std::vector<std::size_t> ends;
  auto separator = [&] {
    if (!out.empty() && out.back() != '-') {
      out.push_back('-');
      ends.push_back(out.size());
    }
  };
  for (std::size_t i = 0; i < text.size();) {
    const CodePoint cp = decode_utf8(text, i);
    if (cp.length == 0) {
      separator();
      ++i;
      continue;
    }
    if (cp.length == 1 ? keep_ascii(text[i]) : keep_non_ascii(cp.value)) {
      out.append(text.substr(i, cp.length));
      ends.push_back(out.size());
    } else {
      separator();
    }
    i += cp.length;
  }
  // Trim the start: no leading dot (hidden file, "." or ".."), dash (read as an option) or '_'.
  std::size_t start = 0;
  while (start < out.size() && is_trim_char(out[start])) ++start;
  out.erase(0, start);
  for (auto& e : ends) e = e >= start ? e - start : 0;
  if (out.size() > max_bytes) {
    std::size_t cut = 0;
    for (std::size_t e : ends) {
      if (e <= max_bytes) cut = e;
    }
    out.resize(cut);
  }
  while (!out.empty() && is_trim_char(out.back())) out.pop_back();
  if (!out.empty() && is_windows_reserved(out)) {
    const std::size_t dot = out.find('.');
    out.insert(dot == std::string::npos ? out.size() : dot, "_");
    if (out.size() > max_bytes) return {};
  }
  return out;
}

}  // namespace

std::string read_file(const std::string& path) {
  const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
  if (fd < 0) {
    throw FileError(fmt::format("{}: cannot read: {}", path, os_reason(errno)));
  }
  struct stat st;
  if (::fstat(fd, &st) != 0) {
    const int err = errno;
    ::close(fd);
    throw FileError(fmt::format("{}: cannot read: {}", path, os_reason(err)));
  }
  if (S_ISDIR(st.st_mode)) {
    ::close(fd);
    throw FileError(fmt::format("{}: cannot read: it is a folder, not a file", path));
  }
  std::string out;
  if (S_ISREG(st.st_mode) && st.st_size > 0) out.reserve(static_cast<std::size_t>(st.st_size));
  char chunk[1 << 16];
  for (;;) {
    const ssize_t n = ::read(fd, chunk, sizeof chunk);
    if (n < 0) {
      if (errno == EINTR) continue;
      const int err = errno;
      ::close(fd);
      throw FileError(fmt::format("{}: cannot read: {}", path, os_reason(err)));
    }
    if (n == 0) break;
    out.append(chunk, static_cast<std::size_t>(n));
  }
  ::close(fd);
  return out;
}

std::string sanitize_file_stem(std::string_view text, std::string_view fallback,
                               std::size_t max_bytes) {
  if (max_bytes == 0) max_bytes = 1;
  std::string stem = sanitize_once(text, max_bytes);
  if (stem.empty()) stem = sanitize_once(fallback, max_bytes);
  if (stem.empty()) stem = sanitize_once("trimwright", max_bytes);
  if (stem.empty()) stem = "t";  // max_bytes below the length of every fallback
  return stem;
}

bool is_plain_file_name(std::string_view name) {
  if (name.empty() || name.size() > 200 || name.front() == '.') return false;
  for (char c : name) {
    const auto u = static_cast<unsigned char>(c);
    if (c == '/' || c == '\\' || u < 0x20 || u == 0x7f) return false;
  }
  return true;
}

}  // namespace trimwright::io
