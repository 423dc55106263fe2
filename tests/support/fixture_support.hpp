// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
// Shared pieces of the fixture tests: a base request and setting look-up.
#include <catch2/catch.hpp>

#include <string>

#include "geom/fixture/fixture.hpp"

namespace trimwright::test {

/// Our own base scenario: a 5/8-inch bench-grinder spindle at 3450 rpm, an ISO 7089-like washer
/// (2 × and 0.18 × the spindle), PETG at 1.27 g/cm³. Tests change what they need from here.
inline fixture::Request grinder_request(double unbalance_gmm, double angle_deg) {
  fixture::Request r;
  r.need.unbalance_gmm = unbalance_gmm;
  r.need.angle_deg = angle_deg;
  r.machine.speed_rpm = 3450;
  r.machine.spindle_diameter_mm = 15.875;
  r.machine.nut_height_mm = 9.5;
  r.machine.washer_diameter_mm = 31.75;
  r.machine.washer_thickness_mm = 2.86;
  r.print.material = "PETG";
  r.print.density_g_cm3 = 1.27;
  r.source = "test";
  return r;
}

/// The value of a setting key in a design (fails the test when absent).
inline double setting(const fixture::Design& d, const std::string& key) {
  for (const auto& v : d.setting)
    if (v.key == key) return v.value;
  FAIL("no setting " << key);
  return 0;
}

}  // namespace trimwright::test
