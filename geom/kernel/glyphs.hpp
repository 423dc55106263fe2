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
  double height_mm = 3.0;   ///< ink height of the font's digits (the tallest, overshoot included), mm
  double angle_deg = 0;     ///< baseline direction, counter-clockwise from +x, seen from +z
};

/// Outline rings of `text` (even-odd fill, any orientation) in the part frame, reading correctly
/// seen from +z, the centre of the text's own ink box at `where.centre`. Curves are flattened to
/// within tolerance_mm (vertices on the curves). Text without ink (empty, spaces) gives no rings.
/// Throws FileError when the font produces no outlines for text that has ink (fontconfig may
/// substitute another family for a missing DejaVu Sans; that is accepted if it has the glyphs),
/// InternalError for a height or tolerance that is not finite and > 0.
std::vector<Ring> text_outline(const std::string& text, const TextPlacement& where,
                               double tolerance_mm = 0.02);

/// Width and height (mm) of the ink box of `text` set at digit height height_mm ({0, 0} for text
/// without ink).
Vec2 text_extent(const std::string& text, double height_mm);

/// Thinnest stroke of the engraving font's digits, as a fraction of the digit height
/// (measured once from the outlines: the shortest distance across the ink between facing walls),
/// so callers can keep engraved strokes printable. About 0.14 for DejaVu Sans Bold.
double digit_stroke_fraction();

}  // namespace trimwright::kernel
