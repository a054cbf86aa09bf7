// The LQG filter shared by the lqg module and `upright design`: its gains solve the filter
// Riccati equations they stand for, the continuous gain the analysis uses is the limit of the
// discrete one the module runs, and the accelerometer row carries the disturbances it feels.
#include "upright/design/lqg_filter.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <string>

#include "demo_robot.hpp"
#include "succeeded.hpp"
#include "upright/design/design_set.hpp"
#include "upright/model/conventions.hpp"

namespace upright::design {
namespace {

using Eigen::MatrixXd;

struct Case {
  const char* robot;
  InputKind input;
};

class LqgFilterTest : public ::testing::TestWithParam<Case> {
 protected:
  // The filter at period_s; a test failure (and an exception) when it cannot be designed.
  LqgFilter Design(double period_s) const {
    const Result<LqgFilter, SolveError> filter = DesignLqgFilter(
        model_, plant_, torque_plant_, DefaultFilterNoise(model_, plant_), period_s);
    EXPECT_TRUE(Succeeded(filter));
    return filter.value();
  }
  model::RobotModel model_ = Demo(std::string(GetParam().robot) + ".xml");
  LinearModel plant_ = Linearise(model_, GetParam().input);
  LinearModel torque_plant_ = Linearise(model_, InputKind::kTorque);
};

TEST_P(LqgFilterTest, DiscreteGainIsTheSteadyStateOfTheFilterRiccatiEquation) {
  // A-priori form (Anderson and Moore, Optimal Filtering, 1979, ch. 4; from memory):
  // P = Ad P Adᵀ − Ad P Cᵀ (C P Cᵀ + R)⁻¹ C P Adᵀ + Q, L = P Cᵀ (C P Cᵀ + R)⁻¹, and the error
  // dynamics Ad (I − L C) inside the unit circle.
  const LqgFilter f = Design(1 / model_.control_rate_hz);
  const MatrixXd& P = f.P_discrete;
  const MatrixXd& C = f.sensors.C;
  const MatrixXd S = C * P * C.transpose() + f.sensors.Rv;
  const MatrixXd residual = f.Ad * P * f.Ad.transpose() -
                            f.Ad * P * C.transpose() * S.inverse() * C * P * f.Ad.transpose() +
                            f.Qd - P;
  EXPECT_LT(residual.norm(), 1e-9 * P.norm()) << residual;
  EXPECT_LT((f.L_discrete - P * C.transpose() * S.inverse()).norm(), 1e-9 * f.L_discrete.norm());
  const MatrixXd error_dynamics =
      f.Ad * (MatrixXd::Identity(kStates, kStates) - f.L_discrete * C);
  EXPECT_LT(error_dynamics.eigenvalues().cwiseAbs().maxCoeff(), 1.0);
}

TEST_P(LqgFilterTest, ContinuousGainIsTheLimitOfTheDiscreteOne) {
  // The analysis of `upright design` uses the Kalman–Bucy gain L_c for the intensities Qc = Qd / T0
  // and Rc = Rv T0 of the filter the module runs every T0. Sampling that continuous filter every
  // T (Qd = Qc T, Rd = Rc / T) gives L_d with L_d / T → L_c as T → 0, the error first order in T
  // once T is well below the filter's fastest time constant (Anderson and Moore, Optimal
  // Filtering, 1979; from memory). With the demo robots' precise sensors that takes T of tens of
  // microseconds: at the control period itself L_d / T0 and L_c differ by 70–100 %, which is why
  // the LQG figures of `upright design` are marked as those of the continuous filter.
  const double T0 = 1 / model_.control_rate_hz;
  const LqgFilter f = Design(T0);
  const MatrixXd Qc = f.Qd / T0, Rc = f.sensors.Rv * T0;
  const auto poles = (plant_.A - f.L * f.sensors.C).eigenvalues();
  for (int i = 0; i < poles.size(); ++i) EXPECT_LT(poles(i).real(), 0) << poles(i);
  constexpr int kHalvings = 14;
  double error[kHalvings];
  for (int k = 0; k < kHalvings; ++k) {
    const double T = T0 / (1 << k);
    const Result<ZohSystem, SolveError> sampled = DiscretiseZoh(plant_.A, plant_.B, T);
    ASSERT_TRUE(Succeeded(sampled));
    const Result<Eigen::MatrixXd, SolveError> d =
        DiscreteKalmanGain(sampled->Ad, f.sensors.C, Qc * T, Rc / T);
    ASSERT_TRUE(Succeeded(d));
    if (k == 0) {
      EXPECT_LT(((*d) - f.L_discrete).norm(), 1e-9 * f.L_discrete.norm());
    }
    error[k] = ((*d) / T - f.L).norm() / f.L.norm();
    if (k > 0) {
      EXPECT_LT(error[k], error[k - 1]) << "T = " << T;
    }
  }
  EXPECT_GT(error[0], 0.5);  // the sampled filter is far from its continuous limit at T0
  for (int k = kHalvings - 3; k < kHalvings; ++k) {
    EXPECT_NEAR(error[k] / error[k - 1], 0.5, 0.05) << "T = " << T0 / (1 << k);
  }
  EXPECT_LT(error[kHalvings - 1], 5e-3);
}

TEST_P(LqgFilterTest, AccelerometerVarianceCarriesTheDisturbancesItFeels) {
  // f_x / g = (ẍ + h θ̈) / g − θ: a push P and pitch torque τ held over the sample add
  // (E_ẋ + h E_θ̇)·w / g at once; their variance joins the sensor's own on that row only.
  const LqgFilter f = Design(1 / model_.control_rate_hz);
  const SensorLinearisation plain = LineariseSensors(model_, plant_);
  const FilterNoise noise = DefaultFilterNoise(model_, plant_);
  const double h = model_.sensors.imu_z_m, g = model::kStandardGravity_m_s2;
  const double per_push = (plant_.E(kXDot, 0) + h * plant_.E(kPitchRate, 0)) / g;
  const double per_torque = (plant_.E(kXDot, 1) + h * plant_.E(kPitchRate, 1)) / g;
  const double added = per_push * per_push * noise.push_sigma_N * noise.push_sigma_N +
                       per_torque * per_torque * noise.torque_sigma_Nm * noise.torque_sigma_Nm;
  MatrixXd expected = plain.Rv;
  expected(4, 4) += added;
  EXPECT_LT((f.sensors.Rv - expected).norm(), 1e-15 * expected.norm());
  EXPECT_GT(added, 10 * plain.Rv(4, 4));  // on the demo robots the disturbances dominate
  EXPECT_EQ(f.sensors.C, plain.C);
  EXPECT_EQ(f.sensors.D, plain.D);
}

TEST_P(LqgFilterTest, DesignAnalysesThisFilter) {
  DesignRequest request;
  request.input = GetParam().input;
  const DesignSet d = DesignAll(model_, request);
  ASSERT_TRUE(d.lqg.ok) << d.lqg.message;
  const LqgFilter f = Design(1 / model_.control_rate_hz);
  EXPECT_EQ(d.lqg.L, f.L);
  EXPECT_EQ(d.lqg.L_discrete, f.L_discrete);
  EXPECT_EQ(d.lqg.sensors.Rv, f.sensors.Rv);
  const double fastest = (plant_.A - f.L * f.sensors.C).eigenvalues().cwiseAbs().maxCoeff();
  EXPECT_EQ(d.lqg.estimator_fastest_1_s, fastest);
  // Its poles are among the loop's (the separation principle, as in synthesis_test.cpp).
  double nearest = 1e300;
  for (const auto& p : d.lqg.loop.poles) nearest = std::min(nearest, std::abs(std::abs(p) - fastest));
  EXPECT_LT(nearest, 1e-6 * fastest);
}

INSTANTIATE_TEST_SUITE_P(Robots, LqgFilterTest,
                         ::testing::Values(Case{"courier", InputKind::kTorque},
                                           Case{"courier", InputKind::kVoltage},
                                           Case{"tabletop", InputKind::kTorque}),
                         [](const ::testing::TestParamInfo<Case>& param) {
                           return std::string(param.param.robot) +
                                  (param.param.input == InputKind::kTorque ? "_torque" : "_voltage");
                         });

}  // namespace
}  // namespace upright::design
