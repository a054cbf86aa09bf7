#include "upright/design/closed_loop.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <vector>

#include "upright/base/number_text.hpp"
#include "upright/design/simultaneous_margins.hpp"

namespace upright::design {
namespace {

using Eigen::MatrixXd;

// Plant with the controller's loop closed on every channel except `open` (−1: all closed), as one
// state-space system with states [x; xc]. Its input is the plant input of channel `open` (or the
// push w when open < 0); its output is u_c of that channel (or z). kAllOpen: every channel open,
// inputs the plant inputs, outputs u_c.
struct Interconnection {
  MatrixXd A, B, C, D;
};
constexpr int kAllOpen = -2;

// The plant as the loop sees it: states the controller never reads and that act on nothing
// (position and heading, for a controller of speed and yaw rate only) are left out, since they
// only integrate the others and would show as spurious poles at zero.
struct LoopPlant {
  MatrixXd A, B, E, Q;  // Q: the performance weight on the kept states
  Measurement meas;
};

LoopPlant Reduce(const LinearModel& plant, const Measurement& meas, const StateMatrix& Q) {
  std::vector<int> keep;
  for (int i = 0; i < kStates; ++i) {
    const bool read = meas.Cy.col(i).cwiseAbs().maxCoeff() > 0;
    const bool acts = plant.A.col(i).cwiseAbs().maxCoeff() > 0;
    if (read || acts) keep.push_back(i);
  }
  const int n = static_cast<int>(keep.size());
  LoopPlant r;
  r.A.resize(n, n);
  r.B.resize(n, kInputs);
  r.E.resize(n, kDisturbances);
  r.Q.resize(n, n);
  r.meas.Cy.resize(meas.Cy.rows(), n);
  r.meas.Dy = meas.Dy;
  for (int i = 0; i < n; ++i) {
    r.B.row(i) = plant.B.row(keep[i]);
    r.E.row(i) = plant.E.row(keep[i]);
    r.meas.Cy.col(i) = meas.Cy.col(keep[i]);
    for (int j = 0; j < n; ++j) {
      r.A(i, j) = plant.A(keep[i], keep[j]);
      r.Q(i, j) = Q(keep[i], keep[j]);
    }
  }
  return r;
}

// Solves the algebraic loop y = Cy x + Dy u_p, u_c = Cc xc + Dc y, for loop-free forms: requires
// Dc Dy = 0 (a controller with direct feedthrough reads sensors without it, and vice versa).
Interconnection Connect(const LoopPlant& plant, const LinearController& ctrl,
                        const Performance* performance, int open) {
  const Measurement& meas = plant.meas;
  const int n = static_cast<int>(plant.A.rows()), nc = ctrl.states();
  // u_c = Cc xc + Dc (Cy x + Dy u_p); with Dc Dy = 0: u_c = Dc Cy x + (Cc) xc + (Dc Dy = 0).
  // The plant input u_p equals u_c except on the open channel, where it is the external v.
  // y = Cy x + Dy u_p feeds the controller states: ẋc = Ac xc + Bc y.
  MatrixXd select_closed = MatrixXd::Identity(kInputs, kInputs);  // picks u_c into u_p
  MatrixXd select_open = MatrixXd::Zero(kInputs, 1);             // puts v into u_p
  if (open >= 0) {
    select_closed(open, open) = 0;
    select_open(open, 0) = 1;
  } else if (open == kAllOpen) {
    select_closed.setZero();
    select_open = MatrixXd::Identity(kInputs, kInputs);
  }
  // u_c = Ux [x; xc]
  MatrixXd Ux(kInputs, n + nc);
  Ux << ctrl.Dc * meas.Cy, ctrl.Cc;
  // u_p = select_closed Ux [x; xc] + select_open v
  const MatrixXd Up = select_closed * Ux;
  // With Dy ≠ 0 the controller state equation sees u_p through y.
  Interconnection s;
  s.A = MatrixXd::Zero(n + nc, n + nc);
  s.A.topRows(n) = plant.B * Up;
  s.A.topLeftCorner(n, n) += plant.A;
  if (nc > 0) {
    s.A.bottomRows(nc) = ctrl.Bc * meas.Dy * Up;
    s.A.block(n, 0, nc, n) += ctrl.Bc * meas.Cy;
    s.A.bottomRightCorner(nc, nc) += ctrl.Ac;
  }
  if (open == kAllOpen) {
    s.B = MatrixXd::Zero(n + nc, kInputs);
    s.B.topRows(n) = plant.B;
    if (nc > 0) s.B.bottomRows(nc) = ctrl.Bc * meas.Dy;
    s.C = -Ux;  // L = −(v → u_c) under negative feedback
    s.D = MatrixXd::Zero(kInputs, kInputs);
  } else if (open >= 0) {
    s.B = MatrixXd::Zero(n + nc, 1);
    s.B.topRows(n) = plant.B * select_open;
    if (nc > 0) s.B.bottomRows(nc) = ctrl.Bc * meas.Dy * select_open;
    // Loop gain under negative feedback: L = −(v → u_c of the open channel).
    s.C = -Ux.row(open);
    s.D = MatrixXd::Zero(1, 1);
  } else {
    s.B = MatrixXd::Zero(n + nc, 1);
    s.B.topRows(n) = plant.E.col(0) * performance->push_scale_N;
    // z = [Q½ x; R½ u_p]
    const MatrixXd q_half = plant.Q.cwiseSqrt();  // Q is diagonal (Bryson's rule)
    const MatrixXd r_half = performance->R.cwiseSqrt();
    s.C = MatrixXd::Zero(n + kInputs, n + nc);
    s.C.topLeftCorner(n, n) = q_half;
    s.C.bottomRows(kInputs) = r_half * Up;
    s.D = MatrixXd::Zero(n + kInputs, 1);
  }
  return s;
}

// A controller with feedthrough on a sensor that feels the input: the loop has no explicit form.
bool AlgebraicLoop(const Measurement& meas, const LinearController& ctrl) {
  return ctrl.Dc.size() > 0 && meas.Dy.size() > 0 && (ctrl.Dc * meas.Dy).norm() > 0;
}

}  // namespace

Measurement FullState() {
  return {MatrixXd::Identity(kStates, kStates), MatrixXd::Zero(kStates, kInputs)};
}

LinearController StateFeedback(const Eigen::Matrix<double, kInputs, kStates>& K) {
  LinearController c;
  c.Ac = MatrixXd::Zero(0, 0);
  c.Bc = MatrixXd::Zero(0, kStates);
  c.Cc = MatrixXd::Zero(kInputs, 0);
  c.Dc = -K;
  return c;
}

AnalysisResult<LoopAnalysis> AnalyseLoop(const LinearModel& plant, const Measurement& meas,
                                         const LinearController& ctrl,
                                         const Performance& performance) {
  LoopAnalysis out;
  const auto stopped = [&out](std::string why) {
    return Failure(AnalysisFailure<LoopAnalysis>{std::move(why), std::move(out)});
  };
  if (AlgebraicLoop(meas, ctrl)) {
    return stopped("controller feedthrough on a sensor that feels the input (an algebraic loop)");
  }
  const LoopPlant reduced = Reduce(plant, meas, performance.Q);
  const Interconnection closed = Connect(reduced, ctrl, &performance, -1);
  const Eigen::VectorXcd eig = closed.A.eigenvalues();
  out.poles.assign(eig.data(), eig.data() + eig.size());
  std::sort(out.poles.begin(), out.poles.end(), [](auto a, auto b) {
    return a.real() != b.real() ? a.real() < b.real() : a.imag() < b.imag();
  });
  const double worst = out.poles.empty() ? -1 : out.poles.back().real();
  if (!(worst < 0)) {
    out.push_norm = std::numeric_limits<double>::infinity();
    return stopped("closed loop unstable: pole at " + ComplexText(out.poles.back(), 6));
  }
  const AnalysisResult<NormPeak> norm = HinfNorm({closed.A, closed.B, closed.C, closed.D});
  out.push_norm = norm ? norm->norm : norm.error().found.norm;
  std::vector<AnalysisResult<LoopMargins>> channels;
  for (int j = 0; j < kInputs; ++j) {
    const Interconnection loop = Connect(reduced, ctrl, nullptr, j);
    channels.push_back(SisoMargins({loop.A, loop.B, loop.C, loop.D}));
    out.channel_margins.push_back(channels.back() ? *channels.back()
                                                  : channels.back().error().found);
  }
  const AnalysisResult<LoopMargins> margins = WorstOf(channels);
  out.margins = margins ? *margins : margins.error().found;
  const Interconnection all_open = Connect(reduced, ctrl, nullptr, kAllOpen);
  const AnalysisResult<LoopMargins> both =
      SimultaneousMargins(BrokenLoop{all_open.A, all_open.B, all_open.C});
  out.both_wheels = both ? *both : both.error().found;
  if (!margins) return stopped(margins.error().message);
  if (!both) return stopped(both.error().message);
  if (!norm) return stopped(norm.error().message);
  return out;
}

BrokenLoop LoopAtWheels(const LinearModel& plant, const Measurement& meas,
                        const LinearController& ctrl) {
  if (AlgebraicLoop(meas, ctrl)) return {};
  const Interconnection open =
      Connect(Reduce(plant, meas, StateMatrix::Zero()), ctrl, nullptr, kAllOpen);
  return BrokenLoop{open.A, open.B, open.C};
}

StateSpace PushedLoop(const LinearModel& plant, const Measurement& meas,
                      const LinearController& ctrl) {
  if (AlgebraicLoop(meas, ctrl)) return {};
  // Every state kept: Reduce with every state read keeps them all.
  LoopPlant full =
      Reduce(plant, {MatrixXd::Identity(kStates, kStates), meas.Dy}, StateMatrix::Zero());
  full.meas = meas;
  Performance unit;
  unit.Q = StateMatrix::Zero();
  unit.R = Eigen::Matrix2d::Zero();
  unit.push_scale_N = 1;
  const Interconnection closed = Connect(full, ctrl, &unit, -1);
  const int nc = ctrl.states();
  StateSpace pushed;
  pushed.A = closed.A;
  pushed.B = closed.B;
  pushed.C = MatrixXd::Zero(kStates + kInputs, kStates + nc);
  pushed.C.topLeftCorner(kStates, kStates).setIdentity();
  pushed.C.bottomLeftCorner(kInputs, kStates) = ctrl.Dc * meas.Cy;
  if (nc > 0) pushed.C.bottomRightCorner(kInputs, nc) = ctrl.Cc;
  pushed.D = MatrixXd::Zero(kStates + kInputs, 1);
  return pushed;
}

}  // namespace upright::design
