#include "upright/design/loop_response.hpp"

#include <cmath>
#include <limits>
#include <numbers>

namespace upright::design {
namespace {

using Complex = std::complex<double>;

bool SizesAgree(const BrokenLoop& loop) {
  return loop.A.rows() == loop.A.cols() && loop.B.rows() == loop.A.rows() &&
         loop.C.cols() == loop.A.rows() && loop.C.rows() == loop.B.cols();
}

// Channel j of x' = A x + B v, u = −C x, the other channels closed (v_i = u_i).
StateSpace OneChannel(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B, const Eigen::MatrixXd& C,
                      int channel) {
  Eigen::MatrixXd others_closed = A - B * C;
  others_closed += B.col(channel) * C.row(channel);
  return {others_closed, B.col(channel), C.row(channel), Eigen::MatrixXd::Zero(1, 1)};
}

}  // namespace

StateSpace LoopAtInput(const BrokenLoop& loop, int channel) {
  if (!SizesAgree(loop) || channel < 0 || channel >= loop.B.cols()) return {};
  return OneChannel(loop.A, loop.B, loop.C, channel);
}

StateSpace CommonModeLoop(const BrokenLoop& loop) {
  if (!SizesAgree(loop) || loop.B.cols() != 2) return {};
  // T = [1 1; 1 −1]/√2 is its own inverse: u_modes = T u, B_modes = B T, C_modes = T C.
  Eigen::Matrix2d T;
  T << 1, 1, 1, -1;
  T /= std::sqrt(2.0);
  return OneChannel(loop.A, loop.B * T, T * loop.C, 0);
}

std::vector<std::complex<double>> FrequencyResponse(const StateSpace& siso, double period_s,
                                                    const std::vector<double>& omegas_rad_s) {
  const Eigen::Index n = siso.A.rows();
  const double d = siso.D.size() > 0 ? siso.D(0, 0) : 0.0;
  const Complex nan(std::numeric_limits<double>::quiet_NaN(),
                    std::numeric_limits<double>::quiet_NaN());
  std::vector<Complex> values;
  values.reserve(omegas_rad_s.size());
  const bool sized = siso.A.cols() == n && siso.B.rows() == n && siso.C.cols() == n &&
                     siso.B.cols() >= 1 && siso.C.rows() >= 1;
  if (!sized && n > 0) return std::vector<Complex>(omegas_rad_s.size(), nan);
  const Eigen::MatrixXcd a = siso.A.cast<Complex>();
  const Eigen::VectorXcd b = n > 0 ? Eigen::VectorXcd(siso.B.col(0).cast<Complex>())
                                   : Eigen::VectorXcd();
  const Eigen::RowVectorXcd c = n > 0 ? Eigen::RowVectorXcd(siso.C.row(0).cast<Complex>())
                                      : Eigen::RowVectorXcd();
  for (const double omega : omegas_rad_s) {
    if (n == 0) {
      values.push_back(d);
      continue;
    }
    const Complex point = period_s > 0 ? std::polar(1.0, omega * period_s) : Complex(0, omega);
    Eigen::MatrixXcd pencil = -a;
    pencil.diagonal().array() += point;
    const Eigen::PartialPivLU<Eigen::MatrixXcd> lu(pencil);
    // A pivot of (near) zero: the frequency sits on a pole of the loop.
    const double smallest = lu.matrixLU().diagonal().cwiseAbs().minCoeff();
    if (!(smallest > 1e-14 * std::max(1.0, pencil.cwiseAbs().maxCoeff()))) {
      values.push_back(nan);
      continue;
    }
    values.push_back((c * lu.solve(b))(0) + d);
  }
  return values;
}

std::vector<double> LogFrequencies(double lo_rad_s, double hi_rad_s, int per_decade) {
  if (!(lo_rad_s > 0 && hi_rad_s > lo_rad_s && std::isfinite(hi_rad_s) && per_decade >= 1)) {
    return {};
  }
  const double decades = std::log10(hi_rad_s / lo_rad_s);
  const int intervals = std::max(1, static_cast<int>(std::ceil(decades * per_decade - 1e-9)));
  std::vector<double> omegas;
  omegas.reserve(intervals + 1);
  for (int i = 0; i <= intervals; ++i) {
    omegas.push_back(i == intervals ? hi_rad_s
                                    : lo_rad_s * std::pow(10.0, decades * i / intervals));
  }
  return omegas;
}

std::vector<double> UnwrappedPhaseDeg(const std::vector<std::complex<double>>& values) {
  constexpr double kDeg = 180.0 / std::numbers::pi;
  std::vector<double> phase;
  phase.reserve(values.size());
  bool have_previous = false;
  double previous = 0;
  for (const Complex& v : values) {
    if (!std::isfinite(v.real()) || !std::isfinite(v.imag())) {
      phase.push_back(std::numeric_limits<double>::quiet_NaN());
      have_previous = false;
      continue;
    }
    double p = std::arg(v) * kDeg;  // [−180, 180]
    if (p > 0) p -= 360;            // (−360, 0]
    if (have_previous) p -= 360 * std::round((p - previous) / 360);
    phase.push_back(p);
    previous = p;
    have_previous = true;
  }
  return phase;
}

}  // namespace upright::design
