// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Internal to tw_io: UTF-8 decoding and XML escaping shared by the writers.

#include <cstddef>
#include <string>
#include <string_view>

namespace trimwright::io::detail {

/// One decoded UTF-8 code point: its value and byte length; length 0 for an invalid sequence
/// (bad lead or continuation byte, overlong form, surrogate, beyond U+10FFFF, cut short).
struct CodePoint {
  char32_t value = 0;
  std::size_t length = 0;
};

/// Decode the code point starting at byte `i` of `s` (i < s.size()).
CodePoint decode_utf8(std::string_view s, std::size_t i);

/// Append the UTF-8 encoding of `cp` (≤ U+10FFFF, not a surrogate) to `out`.
void append_utf8(std::string& out, char32_t cp);

/// `text` escaped for XML character data and attribute values: & < > " ' as entities; tab, LF
/// and CR as character references (so attribute values keep them); other control characters and
/// invalid UTF-8 as U+FFFD (XML 1.0 cannot hold them).
std::string xml_escape(std::string_view text);

}  // namespace trimwright::io::detail
