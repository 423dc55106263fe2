// SPDX-License-Identifier: GPL-3.0-or-later
// The correction a design is built for: given in the job, or solved from its readings.
#include <fmt/format.h>

#include "cli/pipeline.hpp"
#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"

namespace trimwright::cli {

Correction find_correction(const Job& job) {
  Correction c;
  if (job.correction) {
    c.unbalance_gmm = job.correction->unbalance_gmm;
    c.angle_deg = wrap_deg_360(job.correction->angle_deg);
    c.method = "given";
    if (job.correction->mass_g && job.correction->radius_mm) {
      c.mass_g = job.correction->mass_g;
      c.radius_mm = job.correction->radius_mm;
    }
    return c;
  }
  throw InputError(fmt::format("{}: [readings]: solving readings inside `design` is not wired yet", job.source));
}

}  // namespace trimwright::cli
