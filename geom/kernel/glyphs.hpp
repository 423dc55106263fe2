// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Text outlines for engraving, from the system font through Cairo (DejaVu Sans Bold by default).

#include <string>
#include <vector>

#include "geom/kernel/mesh.hpp"

namespace trimwright::kernel {

/// Where and how big a piece of text is set.
struct TextPlacement {
  Vec2 centre{0, 0};        ///< centre of the text's ink box, mm
  double height_mm = 3.0;   ///< height of a digit (cap height), mm
  double angle_deg = 0;     ///< baseline direction, counter-clockwise from +x, seen from +z
};

/// Outline rings of `text` (even-odd fill) in the part frame, reading correctly seen from +z.
/// Curves are flattened to within tolerance_mm. Throws FileError when the font is missing.
std::vector<Ring> text_outline(const std::string& text, const TextPlacement& where,
                               double tolerance_mm = 0.02);

/// Width and height (mm) of the ink box of `text` at height_mm.
Vec2 text_extent(const std::string& text, double height_mm);

/// Thinnest stroke of the engraving font's digits, as a fraction of the digit height
/// (measured from the font), so callers can keep engraved strokes printable.
double digit_stroke_fraction();

}  // namespace trimwright::kernel
