// The PID rule's pole choices (PidPoles): the gains place the planar loop's and the yaw loop's
// poles where the settings ask, the defaults give the rule's gains of before, and the settings
// the rule refuses are refused with the field, its value and the rule.
#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>
#include <complex>
#include <string>
#include <vector>

#include "demo_robot.hpp"
#include "upright/design/design_set.hpp"
#include "upright/design/pid.hpp"
#include "upright/model/conventions.hpp"

namespace upright::design {
namespace {

using Complex = std::complex<double>;

// An expected root and how close a computed one must come, relative to its size. A simple root
// moves by a few ulps of the gains times its condition: 1e-8 is far above that and far below any
// misplaced pole. A double root (ζ = 1, the yaw loop's −ω_y/2) splits by about the square root of
// the coefficients' rounding, amplified by the controllability matrix's conditioning in Ackermann's
// formula: 1e-5.
struct Root {
  Complex value;
  double rel = 1e-8;
};

// The roots of s² + 2ζω s + ω² for ζ <= 1: −ζω ± jω√(1 − ζ²).
std::vector<Root> Pair(double w, double z) {
  const Complex p(-z * w, w * std::sqrt(1 - z * z));
  const double rel = z == 1 ? 1e-5 : 1e-8;
  return {{p, rel}, {std::conj(p), rel}};
}

// Eigenvalues of the planar loop [ξ, v, θ, θ̇] (ξ = ∫v) closed by the cascade, built from the
// plant's own rows of A and B, both wheels taking half of the summed torque:
//   τ_sum = kp (θ − θ_ref) + kd θ̇, θ_ref = speed_kp (0 − v) + speed_ki (0 − ξ).
Eigen::VectorXcd PlanarPoles(const LinearModel& plant, const PidGains& g) {
  const int rows[3] = {kXDot, kPitch, kPitchRate};
  Eigen::Matrix4d a = Eigen::Matrix4d::Zero();
  a(0, 1) = 1;  // ξ̇ = v
  Eigen::Vector4d b = Eigen::Vector4d::Zero();
  for (int i = 0; i < 3; ++i) {
    for (int j = 0; j < 3; ++j) a(i + 1, j + 1) = plant.A(rows[i], rows[j]);
    b(i + 1) = (plant.B(rows[i], model::kLeft) + plant.B(rows[i], model::kRight)) / 2;
  }
  const double kp = g.tilt_kp_Nm_per_rad;
  const Eigen::RowVector4d k(kp * g.speed_ki_rad_per_m, kp * g.speed_kp_rad_per_m_s, kp,
                             g.tilt_kd_Nm_s_per_rad);
  return Eigen::EigenSolver<Eigen::Matrix4d>(a + b * k).eigenvalues();
}

// The yaw-rate loop [∫e_r, ψ̇] with e_r = 0 − ψ̇: ψ̈ = A(ψ̇, ψ̇) ψ̇ + b_ψ τ_diff,
// τ_diff = yaw_kp e_r + yaw_ki ∫e_r.
Eigen::VectorXcd YawPoles(const LinearModel& plant, const PidGains& g) {
  const double b_psi = plant.B(kYawRate, model::kRight);
  Eigen::Matrix2d a;
  a << 0, -1,  //
      b_psi * g.yaw_ki_Nm_per_rad, plant.A(kYawRate, kYawRate) - b_psi * g.yaw_kp_Nm_s_per_rad;
  return Eigen::EigenSolver<Eigen::Matrix2d>(a).eigenvalues();
}

// Each expected root has a computed one within its tolerance.
void ExpectRoots(const Eigen::VectorXcd& got, const std::vector<Root>& expected,
                 const std::string& what) {
  ASSERT_EQ(static_cast<std::size_t>(got.size()), expected.size()) << what;
  for (const Root& p : expected) {
    double nearest = 1e300;
    for (const Complex& q : got) nearest = std::min(nearest, std::abs(p.value - q));
    EXPECT_LT(nearest, p.rel * std::abs(p.value)) << what << ": " << p.value;
  }
}

TEST(PidPoles, TheGainsPlaceThePairsTheSettingsAskFor) {
  // Pole placement: the closed loop's characteristic polynomial is the product of the two pairs'
  // (K. Ogata, "Modern Control Engineering", 5th ed., Prentice Hall, 2010, the chapter on pole
  // placement; from memory), so its eigenvalues are the pairs' roots (tolerances at Root).
  const PidPoles settings[] = {
      {.tilt_pole_factor = 4,
       .tilt_damping = 0.5,
       .speed_pole_factor = 0.5,
       .speed_damping = 0.8,
       .yaw_pole_factor = 2},
      {.tilt_pole_factor = 1.2,
       .tilt_damping = 1,
       .speed_pole_factor = 0.1,
       .speed_damping = 0.3,
       .yaw_pole_factor = 0.5},
      {.tilt_pole_factor = 6,
       .tilt_damping = 0.2,
       .speed_pole_factor = 1,
       .speed_damping = 1,
       .yaw_pole_factor = 3},
  };
  for (const char* robot : {"courier.xml", "tabletop.xml"}) {
    const LinearModel plant = Linearise(Demo(robot), InputKind::kTorque);
    const double lambda = plant.fall_rate_1_s;
    for (const PidPoles& p : settings) {
      ASSERT_TRUE(p.Validate().has_value()) << p.Validate().error();
      const PidGains g = TunePid(plant, p, 3);
      const std::string what = std::string(robot) + " tilt " + std::to_string(p.tilt_pole_factor) +
                               " speed " + std::to_string(p.speed_pole_factor);
      std::vector<Root> planar = Pair(p.tilt_pole_factor * lambda, p.tilt_damping);
      const std::vector<Root> speed = Pair(p.speed_pole_factor * lambda, p.speed_damping);
      planar.insert(planar.end(), speed.begin(), speed.end());
      ExpectRoots(PlanarPoles(plant, g), planar, what);
      const double half = p.yaw_pole_factor * lambda / 2;
      ExpectRoots(YawPoles(plant, g), {{-half, 1e-5}, {-half, 1e-5}}, what + " yaw");
      EXPECT_DOUBLE_EQ(g.tilt_bandwidth_rad_s, p.tilt_pole_factor * lambda) << what;
      EXPECT_DOUBLE_EQ(g.speed_bandwidth_rad_s, p.speed_pole_factor * lambda) << what;
      EXPECT_DOUBLE_EQ(g.yaw_bandwidth_rad_s, p.yaw_pole_factor * lambda) << what;
    }
  }
}

TEST(PidPoles, TheDefaultsAreTheRuleOfBeforeToTheBit) {
  // The defaults place the pairs at 2λ (ζ 0.7), λ/3 (ζ 0.9) and the yaw loop at λ, each computed
  // as the rule always computed it, so the gains are the same doubles: those below were written
  // by `upright design --json models/courier.xml` before the poles became settings (re-pin only
  // when the rule changes on purpose).
  const LinearModel plant = Linearise(Demo("courier.xml"), InputKind::kTorque);
  const double lambda = plant.fall_rate_1_s;
  const PidGains g = TunePid(plant, PidPoles{}, 3);
  EXPECT_EQ(g.tilt_bandwidth_rad_s, 2 * lambda);
  EXPECT_EQ(g.speed_bandwidth_rad_s, lambda / 3);
  EXPECT_EQ(g.yaw_bandwidth_rad_s, lambda);
  EXPECT_EQ(g.tilt_damping, 0.7);
  EXPECT_EQ(g.speed_damping, 0.9);
  const DesignSet d = DesignAll(Demo("courier.xml"), DesignRequest{});
  const PidGains& pinned = d.pid.gains;
  EXPECT_EQ(pinned.tilt_kp_Nm_per_rad, 287.22144697987954);
  EXPECT_EQ(pinned.tilt_kd_Nm_s_per_rad, 64.64702734663632);
  EXPECT_EQ(pinned.speed_kp_rad_per_m_s, 0.31707058075148753);
  EXPECT_EQ(pinned.speed_ki_rad_per_m, 0.3257517971355976);
  EXPECT_EQ(pinned.yaw_kp_Nm_s_per_rad, 4.9187541562403);
  EXPECT_EQ(pinned.yaw_ki_Nm_per_rad, 7.706476042196873);
}

TEST(PidPoles, TheCascadeGainsStayFiniteAndPositiveOverTheSearchedBox) {
  // Over the ranges `upright tune` searches by default (tilt 1–6 λ, speed 0.1–1 λ) and the
  // damping range allowed, wherever the rule accepts the pairs: the tilt loop pushes back
  // (kp, kd > 0) and the speed loop's gains, ratios to kp, are finite.
  for (const char* robot : {"courier.xml", "tabletop.xml"}) {
    const LinearModel plant = Linearise(Demo(robot), InputKind::kTorque);
    for (double tilt : {1.0, 1.5, 2.0, 3.0, 4.5, 6.0}) {
      for (double speed : {0.1, 0.2, 1.0 / 3, 0.5, 0.75, 1.0}) {
        for (double zeta : {0.2, 0.7, 1.0}) {
          const PidPoles p{.tilt_pole_factor = tilt,
                           .tilt_damping = zeta,
                           .speed_pole_factor = speed,
                           .speed_damping = zeta};
          if (!p.Validate()) continue;
          const PidGains g = TunePid(plant, p, 3);
          const std::string what = std::string(robot) + " tilt " + std::to_string(tilt) +
                                   " speed " + std::to_string(speed) + " ζ " + std::to_string(zeta);
          EXPECT_GT(g.tilt_kp_Nm_per_rad, 0) << what;
          EXPECT_GT(g.tilt_kd_Nm_s_per_rad, 0) << what;
          EXPECT_TRUE(std::isfinite(g.speed_kp_rad_per_m_s)) << what;
          EXPECT_TRUE(std::isfinite(g.speed_ki_rad_per_m)) << what;
        }
      }
    }
  }
}

TEST(PidPoles, RefusesSettingsOutsideTheRuleNamingFieldValueAndRule) {
  const std::pair<PidPoles, std::string> cases[] = {
      {{.tilt_pole_factor = 0}, "PidPoles::tilt_pole_factor = 0, must be > 0 and finite"},
      {{.tilt_pole_factor = INFINITY}, "PidPoles::tilt_pole_factor = inf, must be > 0"},
      {{.speed_pole_factor = -1}, "PidPoles::speed_pole_factor = -1, must be > 0 and finite"},
      {{.tilt_pole_factor = 1, .speed_pole_factor = 0.6},
       "PidPoles::speed_pole_factor = 0.6, must be at most half of tilt_pole_factor = 1"},
      {{.tilt_damping = 0.1}, "PidPoles::tilt_damping = 0.1, must be in [0.2, 1]"},
      {{.tilt_damping = NAN}, "PidPoles::tilt_damping = nan, must be in [0.2, 1]"},
      {{.speed_damping = 1.2}, "PidPoles::speed_damping = 1.2, must be in [0.2, 1]"},
      {{.yaw_pole_factor = 0}, "PidPoles::yaw_pole_factor = 0, must be > 0 and finite"},
  };
  for (const auto& [poles, message] : cases) {
    const Status valid = poles.Validate();
    ASSERT_FALSE(valid.has_value()) << message;
    EXPECT_NE(valid.error().find(message), std::string::npos) << valid.error();
  }
  // The edges are inside: the speed pair at exactly half the tilt pair, ζ at 0.2 and 1.
  EXPECT_TRUE(PidPoles({.tilt_pole_factor = 1,
                        .tilt_damping = 0.2,
                        .speed_pole_factor = 0.5,
                        .speed_damping = 1})
                  .Validate()
                  .has_value());
  // A design request carries the rule on.
  DesignRequest request;
  request.pid_poles.speed_damping = 0;
  const Status valid = request.Validate();
  ASSERT_FALSE(valid.has_value());
  EXPECT_NE(valid.error().find("PidPoles::speed_damping = 0"), std::string::npos) << valid.error();
}

}  // namespace
}  // namespace upright::design
