// SPDX-License-Identifier: GPL-3.0-or-later
// Vibration severity: conversion to velocity RMS at running speed and ISO 10816-1 zones.
#include "geom/solve/severity.hpp"

#include <catch2/catch.hpp>
#include <cmath>

#include "geom/base/angle.hpp"

using namespace trimwright::solve;

TEST_CASE("severity: units converted to velocity RMS at running speed", "[solve]") {
  // Standard gravity 9.806 65 m/s² (CGPM), v = a/(2πf): 1 g peak at 57.5 Hz → 27.144 mm/s peak
  // (references.md, "Vibration units").
  const double rpm = 57.5 * 60;
  CHECK(velocity_rms_mm_s(1.0, "g-pk", rpm).value() * std::sqrt(2.0) ==
        Approx(27.144).margin(0.0005));
  // peak = √2 RMS, pp = 2 peak; the same vibration in other units.
  const double v_rms = 27.14394474 / std::sqrt(2.0);
  CHECK(velocity_rms_mm_s(2.0, "g-pp", rpm).value() == Approx(v_rms).epsilon(1e-8));
  CHECK(velocity_rms_mm_s(1.0 / std::sqrt(2.0), "g-rms", rpm).value() ==
        Approx(v_rms).epsilon(1e-8));
  CHECK(velocity_rms_mm_s(27.14394474, "mm/s-pk", rpm).value() == Approx(v_rms).epsilon(1e-8));
  CHECK(velocity_rms_mm_s(v_rms, "mm/s-rms", rpm).value() == Approx(v_rms).epsilon(1e-12));
  CHECK(velocity_rms_mm_s(27.14394474 / 25.4, "in/s-pk", rpm).value() ==
        Approx(v_rms).epsilon(1e-8));
  // d = v/(2πf): 27.144 mm/s peak at 57.5 Hz is 75.13 µm peak, 150.26 µm pp.
  const double d_pp_um = 2 * 27.14394474 / (2 * trimwright::kPi * 57.5) * 1000;
  CHECK(velocity_rms_mm_s(d_pp_um, "um-pp", rpm).value() == Approx(v_rms).epsilon(1e-8));
  CHECK(velocity_rms_mm_s(d_pp_um / 25.4, "mil-pp", rpm).value() == Approx(v_rms).epsilon(1e-8));
  // Any other label, or no speed: no severity (solving still works in that unit).
  CHECK_FALSE(velocity_rms_mm_s(1.0, "counts", rpm));
  CHECK_FALSE(severity(1.0, "g-pk", 0));
}

TEST_CASE("severity: ISO 10816-1 class I zones", "[solve]") {
  // ISO 10816-1 class I zone limits, velocity RMS: 0.71 / 1.8 / 4.5 mm/s (references.md).
  CHECK(zone_of(0.5) == Zone::kA);
  CHECK(zone_of(0.71) == Zone::kA);
  CHECK(zone_of(0.72) == Zone::kB);
  CHECK(zone_of(1.8) == Zone::kB);
  CHECK(zone_of(1.81) == Zone::kC);
  CHECK(zone_of(4.5) == Zone::kC);
  CHECK(zone_of(4.6) == Zone::kD);
  CHECK(std::string(zone_letter(Zone::kC)) == "C");
  const auto s = severity(2.0, "mm/s-pk", 3450);
  REQUIRE(s);
  CHECK(s->velocity_rms_mm_s == Approx(std::sqrt(2.0)));
  CHECK(s->zone == Zone::kB);
}
