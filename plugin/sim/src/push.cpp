#include "upright/sim/push.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>
#include <sstream>

#include "upright/model/conventions.hpp"

namespace upright::sim {
namespace {

// ∫ of the unit-peak profile from the push start to τ (τ clamped to [0, duration]).
double UnitIntegral(PushShape shape, double duration_s, double tau_s) {
  const double t = std::clamp(tau_s, 0.0, duration_s);
  if (shape == PushShape::kHalfSine) {
    return duration_s / std::numbers::pi * (1.0 - std::cos(std::numbers::pi * t / duration_s));
  }
  return t;  // impulse and step are flat
}

}  // namespace

double Push::ForceAt(double t_s) const {
  const double tau = t_s - start_s;
  if (tau < 0 || tau >= duration_s) return 0;
  if (shape == PushShape::kHalfSine) return peak_N * std::sin(std::numbers::pi * tau / duration_s);
  return peak_N;
}

double Push::MeanForce(double t0_s, double t1_s) const {
  if (t1_s <= t0_s) return ForceAt(t0_s);
  if (std::isinf(duration_s)) {  // an endless step
    const double on = std::max(0.0, t1_s - std::max(t0_s, start_s));
    return peak_N * on / (t1_s - t0_s);
  }
  const double impulse = UnitIntegral(shape, duration_s, t1_s - start_s) -
                         UnitIntegral(shape, duration_s, t0_s - start_s);
  return peak_N * impulse / (t1_s - t0_s);
}

Status Push::Validate() const {
  std::ostringstream why;
  if (!std::isfinite(start_s) || start_s < 0) {
    why << "Push::start_s = " << start_s << ", must be finite and >= 0";
  } else if (std::isnan(duration_s) || duration_s <= 0) {
    why << "Push::duration_s = " << duration_s << ", must be > 0";
  } else if (std::isinf(duration_s) && shape != PushShape::kStep) {
    why << "Push::duration_s = inf, only a step may last forever";
  } else if (!std::isfinite(peak_N)) {
    why << "Push::peak_N = " << peak_N << ", must be finite";
  } else if (!std::isfinite(direction_deg)) {
    why << "Push::direction_deg = " << direction_deg << ", must be finite";
  } else if (!std::isfinite(height_m)) {
    why << "Push::height_m = " << height_m << ", must be finite";
  }
  if (why.tellp() == 0) return {};
  return Failure(why.str());
}

const char* ToString(PushShape shape) {
  switch (shape) {
    case PushShape::kImpulse: return "impulse";
    case PushShape::kStep: return "step";
    case PushShape::kHalfSine: return "half-sine";
  }
  return "?";
}

bool FromString(const std::string& text, PushShape* shape) {
  if (text == "impulse") *shape = PushShape::kImpulse;
  else if (text == "step") *shape = PushShape::kStep;
  else if (text == "half-sine") *shape = PushShape::kHalfSine;
  else return false;
  return true;
}

}  // namespace upright::sim
