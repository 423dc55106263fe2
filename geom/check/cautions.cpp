// SPDX-License-Identifier: GPL-3.0-or-later
// The usual cautions (design.md §6), shown by the terminal, the chart, the report and the README.
#include "geom/check/check.hpp"

namespace trimwright::check {

const std::vector<std::string>& cautions() {
  static const std::vector<std::string> list = {
      "Never run a wheel or rotor faster than the maximum speed marked on it.",
      "Ring-test and inspect every abrasive wheel before mounting it; do not use a cracked or chipped wheel.",
      "Keep the guards on and the work rest and spark guard set close to the wheel.",
      "Wear eye and face protection.",
      "At the first start, stand aside, out of the plane of the wheel, and let it run a full minute.",
      "Inspect printed parts for cracks before every use, and re-check the nut's tightness after the first runs.",
      "Follow the machine maker's manual, the abrasive-wheel safety standards (e.g. ANSI B7.1, "
      "EN 12413, OSHA 29 CFR 1910.215) and local codes.",
      "A printed part is not a certified component: you use it at your own risk.",
  };
  return list;
}

}  // namespace trimwright::check
