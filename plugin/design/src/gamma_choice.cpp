#include "upright/design/gamma_choice.hpp"

#include <cmath>
#include <limits>
#include <sstream>

namespace upright::design {
namespace {

// The design push on the central H-infinity loop at γ, within the limits or not; a failure when
// the design or the push response could not be made.
struct Tried {
  Gain K = Gain::Zero();
  PushPeaks peaks;
  bool within = false;
};

bool Within(const PushPeaks& peaks, const PushLimits& limits) {
  return peaks.tilt_rad <= limits.tilt_rad && peaks.current_A <= limits.current_A;
}

// The central H-infinity gain at γ: continuous, or discrete at period_s > 0.
Result<Eigen::MatrixXd, SolveError> HinfAt(const LinearModel& plant, const Performance& perf,
                                           double gamma, double period_s) {
  if (period_s > 0) {
    return RobotDiscreteHinf(plant, perf.Q, perf.R, perf.push_scale_N, gamma, period_s);
  }
  return RobotHinf(plant, perf.Q, perf.R, perf.push_scale_N, gamma);
}

// The design push on the loop of K: continuous, or sampled at period_s > 0.
Result<PushPeaks> PeaksOf(const LinearModel& plant, const Gain& K, const CurrentMap& current,
                          const DesignPush& push, double period_s) {
  if (period_s > 0) return SampledPushPeaks(plant, K, current, push, period_s);
  return LinearPushPeaks(plant, K, current, push);
}

Result<Tried> Try(const LinearModel& plant, const Performance& perf, const CurrentMap& current,
                  const DesignPush& push, const PushLimits& limits, double gamma, double period_s) {
  const Result<Eigen::MatrixXd, SolveError> K = HinfAt(plant, perf, gamma, period_s);
  if (!K) return Failure(K.error().message);
  const Result<PushPeaks> peaks = PeaksOf(plant, *K, current, push, period_s);
  if (!peaks) return Failure(peaks.error());
  return Tried{*K, *peaks, Within(*peaks, limits)};
}

}  // namespace

PushLimits PushLimitsOf(const model::RobotModel& model, double equilibrium_pitch_rad) {
  return PushLimits{GroundContact(model, equilibrium_pitch_rad).smallest_rad(),
                    model.motor.current_limit_A};
}

Result<GammaChoice> ChooseGamma(const LinearModel& plant, const Performance& perf, double gamma_opt,
                                const model::RobotModel& model, double period_s) {
  if (!(gamma_opt > 0) || !std::isfinite(gamma_opt)) {
    std::ostringstream why;
    why << "gamma rule: gamma_opt = " << gamma_opt << ", must be > 0 and finite";
    return Failure(why.str());
  }
  const CurrentMap current = MotorCurrent(model, plant.input);
  const DesignPush push = DesignPushFor(plant, perf.push_scale_N);
  const PushLimits limits = PushLimitsOf(model, plant.equilibrium_pitch_rad);
  const auto tried = [&](double factor) {
    return Try(plant, perf, current, push, limits, factor * gamma_opt, period_s);
  };
  const auto choice = [&](double factor, const Tried& t) {
    return GammaChoice{factor, factor * gamma_opt, t.peaks, t.within};
  };
  const Result<Tried> lowest = tried(kGammaFactorLowest);
  if (lowest && lowest->within) return choice(kGammaFactorLowest, *lowest);
  Result<Tried> highest = tried(kGammaFactorHighest);
  if (!highest) return Failure("gamma rule: " + highest.error());
  if (!highest->within) return choice(kGammaFactorHighest, *highest);
  // Bisection of the factor on a log scale, keeping `hi` within the limits and `lo` outside them
  // (or not designable).
  double lo = kGammaFactorLowest, hi = kGammaFactorHighest;
  Tried at_hi = *highest;
  while (hi / lo > 1.01) {
    const double mid = std::sqrt(lo * hi);
    const Result<Tried> t = tried(mid);
    if (t && t->within) {
      hi = mid;
      at_hi = *t;
    } else {
      lo = mid;
    }
  }
  return choice(hi, at_hi);
}

std::vector<GammaPoint> GammaTradeOff(const LinearModel& plant, const Performance& perf,
                                      double gamma_opt, const model::RobotModel& model,
                                      double period_s) {
  const CurrentMap current = MotorCurrent(model, plant.input);
  const DesignPush push = DesignPushFor(plant, perf.push_scale_N);
  const PushLimits limits = PushLimitsOf(model, plant.equilibrium_pitch_rad);
  const auto row = [&](double factor, const Result<Eigen::MatrixXd, SolveError>& K) {
    GammaPoint p;
    p.factor = factor;
    p.gamma = factor * gamma_opt;
    if (!K) return p;
    const Gain gain = *K;
    double push_norm = 0;
    if (period_s > 0) {
      const AnalysisResult<NormPeak> norm = SampledPushNorm(plant, gain, perf, period_s);
      if (!norm) return p;
      push_norm = norm->norm;
    } else {
      const AnalysisResult<LoopAnalysis> loop =
          AnalyseLoop(plant, FullState(), StateFeedback(gain), perf);
      if (!loop) return p;
      push_norm = loop->push_norm;
    }
    const Result<PushPeaks> peaks = PeaksOf(plant, gain, current, push, period_s);
    if (!peaks) return p;
    Eigen::JacobiSVD<Eigen::MatrixXd> svd(gain);
    p.gain_norm = svd.singularValues()(0);
    p.push_norm = push_norm;
    p.peaks = *peaks;
    p.within_limits = Within(*peaks, limits);
    p.ok = true;
    return p;
  };
  std::vector<GammaPoint> rows;
  for (const double factor : kTradeOffFactors) {
    rows.push_back(row(factor, HinfAt(plant, perf, factor * gamma_opt, period_s)));
  }
  rows.push_back(row(std::numeric_limits<double>::infinity(),
                     period_s > 0 ? RobotDiscreteLqr(plant, perf.Q, perf.R, period_s)
                                  : RobotLqr(plant, perf.Q, perf.R)));
  return rows;
}

}  // namespace upright::design
