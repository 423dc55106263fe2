// SPDX-License-Identifier: GPL-3.0-or-later
// Least-squares sinusoid fit at known times (docs/recordings.md, "Amplitude and phase").
#include "geom/signal/line_fit.hpp"

#include <Eigen/Dense>

#include <cmath>

#include "geom/base/angle.hpp"

namespace trimwright::signal {

LineFit fit_lines(const std::vector<double>& time_s, const std::vector<double>& values,
                  const std::vector<double>* theta_rad, size_t i0, size_t i1, double f1_hz, const LineModel& model) {
  LineFit fit;
  const int orders = std::max(1, model.orders);
  const int nlines = static_cast<int>(model.lines_hz.size());
  const int col_orders = 2;
  const int col_freq = col_orders + 2 * orders;
  const int col_lines = col_freq + (model.frequency_terms ? 2 : 0);
  const int p = col_lines + 2 * nlines;
  if (i1 > values.size() || i1 <= i0 || i1 - i0 < static_cast<size_t>(p + 2)) return fit;

  const double t_first = time_s[i0], t_last = time_s[i1 - 1];
  const double t_mid = 0.5 * (t_first + t_last);
  const double half = t_last > t_first ? 0.5 * (t_last - t_first) : 1.0;

  Eigen::MatrixXd ata = Eigen::MatrixXd::Zero(p, p);
  Eigen::VectorXd aty = Eigen::VectorXd::Zero(p);
  Eigen::VectorXd row(p);
  double yty = 0;
  for (size_t i = i0; i < i1; ++i) {
    const double dt = time_s[i] - t_mid;
    const double tau = dt / half;
    const double theta = theta_rad ? (*theta_rad)[i] : 2.0 * kPi * f1_hz * dt;
    row[0] = 1.0;
    row[1] = tau;
    // cos kθ, sin kθ by complex powers of e^(iθ).
    const std::complex<double> e1(std::cos(theta), std::sin(theta));
    std::complex<double> ek = e1;
    for (int k = 0; k < orders; ++k) {
      row[col_orders + 2 * k] = ek.real();
      row[col_orders + 2 * k + 1] = ek.imag();
      ek *= e1;
    }
    if (model.frequency_terms) {
      row[col_freq] = tau * e1.real();
      row[col_freq + 1] = tau * e1.imag();
    }
    for (int j = 0; j < nlines; ++j) {
      const double ph = 2.0 * kPi * model.lines_hz[static_cast<size_t>(j)] * dt;
      row[col_lines + 2 * j] = std::cos(ph);
      row[col_lines + 2 * j + 1] = std::sin(ph);
    }
    const double y = values[i];
    ata.selfadjointView<Eigen::Upper>().rankUpdate(row);
    aty += y * row;
    yty += y * y;
  }
  Eigen::MatrixXd full = ata.selfadjointView<Eigen::Upper>();
  // Scale to unit diagonal so that the conditioning test does not depend on units.
  Eigen::VectorXd d = full.diagonal();
  for (int i = 0; i < p; ++i)
    if (!(d[i] > 0)) return fit;
  Eigen::VectorXd s = d.cwiseSqrt().cwiseInverse();
  Eigen::MatrixXd scaled = s.asDiagonal() * full * s.asDiagonal();
  Eigen::LDLT<Eigen::MatrixXd> ldlt(scaled);
  if (ldlt.info() != Eigen::Success) return fit;
  const Eigen::VectorXd dv = ldlt.vectorD();
  if (!(dv.minCoeff() > 1e-10 * dv.maxCoeff())) return fit;
  const Eigen::VectorXd beta = s.asDiagonal() * ldlt.solve(s.asDiagonal() * aty);

  const double n = static_cast<double>(i1 - i0);
  const double rss = std::max(0.0, yty - beta.dot(aty));
  const double sigma2 = rss / std::max(1.0, n - p);
  fit.residual_rms = std::sqrt(rss / n);
  // Variance of the 1× coefficients: σ²·diag((AᵀA)⁻¹), averaged over cos and sin.
  Eigen::VectorXd ea = Eigen::VectorXd::Zero(p), eb = Eigen::VectorXd::Zero(p);
  ea[col_orders] = 1;
  eb[col_orders + 1] = 1;
  const double va = s[col_orders] * s[col_orders] * ldlt.solve(ea)[col_orders];
  const double vb = s[col_orders + 1] * s[col_orders + 1] * ldlt.solve(eb)[col_orders + 1];
  fit.coefficient_variance = sigma2 * 0.5 * (va + vb);

  for (int k = 0; k < orders; ++k)
    fit.orders.emplace_back(beta[col_orders + 2 * k], beta[col_orders + 2 * k + 1]);
  for (int j = 0; j < nlines; ++j) fit.lines.emplace_back(beta[col_lines + 2 * j], beta[col_lines + 2 * j + 1]);
  if (model.frequency_terms) {
    // a·cos + b·sin at ω+δ ≈ same at ω − δ·t·(a·sin − b·cos): the τ columns carry c = δ·h·b and
    // d = −δ·h·a, so δ = (c·b − d·a)/(h·(a² + b²)).
    const double a = beta[col_orders], b = beta[col_orders + 1];
    const double c = beta[col_freq], dd = beta[col_freq + 1];
    const double a2 = a * a + b * b;
    if (a2 > 0) fit.frequency_step_hz = (c * b - dd * a) / (half * a2) / (2.0 * kPi);
  }
  fit.ok = true;
  return fit;
}

}  // namespace trimwright::signal
