#include "upright/design/push_response.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>
#include <sstream>
#include <unsupported/Eigen/MatrixFunctions>

#include "upright/design/linear_model.hpp"

namespace upright::design {
namespace {

constexpr int kStepsPerPush = 20;
constexpr double kTimeConstantsAfter = 8;
constexpr double kShortestAfter_s = 1;
constexpr double kLongestAfter_s = 30;

// How long to follow the loop after the push: eight time constants of its slowest decaying pole,
// within [1 s, 30 s]; a failure for a pole to the right of the origin's neighbourhood.
Result<double> TimeAfterPush(const Eigen::MatrixXd& a) {
  const Eigen::VectorXcd poles = a.eigenvalues();
  const double size = poles.size() > 0 ? poles.cwiseAbs().maxCoeff() : 0.0;
  const double origin = 1e-9 * std::max(size, 1e-300);
  double slowest = std::numeric_limits<double>::infinity();
  for (const auto& p : poles) {
    if (!std::isfinite(p.real())) return Failure("push response: the loop is not finite");
    if (std::abs(p) <= origin) continue;  // a state that only integrates
    if (p.real() >= 0) {
      std::ostringstream why;
      why << "push response: the closed loop is unstable (pole " << p.real() << " + "
          << p.imag() << "j)";
      return Failure(why.str());
    }
    slowest = std::min(slowest, -p.real());
  }
  return std::clamp(kTimeConstantsAfter / slowest, kShortestAfter_s, kLongestAfter_s);
}

}  // namespace

Result<PushResponse> ResponseToPush(const StateSpace& pushed, const CurrentMap& current,
                                    const DesignPush& push) {
  const Eigen::Index n = pushed.A.rows();
  if (pushed.A.cols() != n || pushed.B.rows() != n || pushed.B.cols() != 1 ||
      pushed.C.cols() != n || pushed.C.rows() != kStates + kInputs || n < kStates) {
    return Failure("push response: the loop must take the push force and give [x; u]");
  }
  if (Status valid = push.Validate(); !valid) return Failure(valid.error());
  const Result<double> after_s = TimeAfterPush(pushed.A);
  if (!after_s) return Failure(after_s.error());

  // ξ = [x; sin ωt; cos ωt], ω = π / duration: one matrix exponential steps the pushed loop.
  const double omega = std::numbers::pi / push.duration_s;
  Eigen::MatrixXd m = Eigen::MatrixXd::Zero(n + 2, n + 2);
  m.topLeftCorner(n, n) = pushed.A;
  m.block(0, n, n, 1) = pushed.B * push.peak_N();
  m(n, n + 1) = omega;
  m(n + 1, n) = -omega;
  const double step_s = push.duration_s / kStepsPerPush;
  const Eigen::MatrixXd step = (m * step_s).exp();
  const int steps = kStepsPerPush + static_cast<int>(std::ceil(*after_s / step_s));

  PushResponse r;
  for (auto* v : {&r.time_s, &r.push_N, &r.pitch_rad, &r.position_m, &r.current_left_A,
                  &r.current_right_A}) {
    v->reserve(steps + 1);
  }
  Eigen::VectorXd xi = Eigen::VectorXd::Zero(n + 2);
  xi(n + 1) = 1;  // cos 0
  for (int k = 0; k <= steps; ++k) {
    if (k == kStepsPerPush) {
      xi(n) = 0;  // the half-sine ends: the oscillator stops
      xi(n + 1) = 0;
    }
    const Eigen::VectorXd y = pushed.C * xi.head(n);
    const StateVector x = y.head<kStates>();
    const Eigen::Vector2d u = y.tail<kInputs>();
    const Eigen::Vector2d i = current.per_input * u + current.per_state * x;
    const double t = k * step_s;
    r.time_s.push_back(t);
    r.push_N.push_back(k < kStepsPerPush ? push.peak_N() * std::sin(omega * t) : 0.0);
    r.pitch_rad.push_back(x(kPitch));
    r.position_m.push_back(x(kX));
    r.current_left_A.push_back(i(0));
    r.current_right_A.push_back(i(1));
    xi = step * xi;
  }
  return r;
}

}  // namespace upright::design
