#include "upright/sim/plant.hpp"

#include <BulletDynamics/Featherstone/btMultiBody.h>
#include <btBulletDynamicsCommon.h>

#include <algorithm>
#include <cmath>
#include <numbers>
#include <sstream>

#include "contact_readout.hpp"
#include "robot_body.hpp"
#include "sensor_pipeline.hpp"
#include "upright/model/check.hpp"
#include "upright/model/conventions.hpp"
#include "upright/model/model_file.hpp"
#include "world.hpp"

namespace upright::sim {

Status PlantOptions::Validate() const {
  std::ostringstream why;
  if (!(dt_s > 0) || !(dt_s <= 0.01)) {
    why << "PlantOptions::dt_s = " << dt_s << ", must be in (0, 0.01]";
  } else if (solver_iterations < 1 || solver_iterations > 1000) {
    why << "PlantOptions::solver_iterations = " << solver_iterations << ", must be in [1, 1000]";
  } else if (!std::isfinite(initial.x_m) || !std::isfinite(initial.speed_m_s)) {
    why << "PlantOptions::initial x_m = " << initial.x_m << ", speed_m_s = " << initial.speed_m_s
        << ", must be finite";
  } else if (!(std::abs(initial.pitch_rad) < std::numbers::pi / 2)) {
    why << "PlantOptions::initial.pitch_rad = " << initial.pitch_rad << ", must be in (-pi/2, pi/2)";
  } else if (fixed_chassis && !(fixed_height_m > 0 && std::isfinite(fixed_height_m))) {
    why << "PlantOptions::fixed_height_m = " << fixed_height_m << ", must be > 0";
  } else if (!(chassis_friction >= 0 && chassis_friction <= 3)) {
    why << "PlantOptions::chassis_friction = " << chassis_friction << ", must be in [0, 3]";
  } else if (Status valid_terrain = terrain.Validate(); !valid_terrain) {
    why << "PlantOptions::" << valid_terrain.error();
  }
  if (why.tellp() == 0) return {};
  return Failure(why.str());
}

namespace internal {
namespace {

// Rules that tie the model to the options: sample periods that are whole numbers of physics
// steps, and damping terms the explicit step can integrate stably. The first broken one, if any.
Status CheckModelAgainstOptions(const model::RobotModel& model, const PlantOptions& options) {
  std::ostringstream why;
  const double dt = options.dt_s;
  auto whole_steps = [dt](double rate_hz) {
    const double steps = 1.0 / (rate_hz * dt);
    return std::abs(steps - std::round(steps)) < 1e-6 * steps;
  };
  if (!whole_steps(model.control_rate_hz)) {
    why << "control rate_hz = " << model.control_rate_hz << ": its period must be a whole number "
        << "of physics steps of dt_s = " << dt;
  } else if (model.sensors.imu_rate_hz * dt < 1 && !whole_steps(model.sensors.imu_rate_hz)) {
    why << "imu rate_hz = " << model.sensors.imu_rate_hz << ": its period must be a whole number "
        << "of physics steps of dt_s = " << dt << " (or the IMU at least as fast as the physics)";
  } else {
    const model::MotorModel& m = model.motor;
    const double damping = m.viscous_friction_Nm_s_per_rad +
                           m.gear_ratio * m.gear_ratio * m.gear_efficiency *
                               m.torque_constant_Nm_per_A * m.back_emf_V_s_per_rad /
                               m.resistance_ohm;
    const double stiffness = damping * dt / model.wheel.spin_inertia_kgm2;
    if (stiffness > 1.0) {
      why << "motor damping " << damping << " N·m·s/rad on a wheel of spin inertia "
          << model.wheel.spin_inertia_kgm2 << " kg·m² needs dt_s <= "
          << model.wheel.spin_inertia_kgm2 / damping << " (dt_s = " << dt << ")";
    }
  }
  if (why.tellp() == 0) return {};
  return Failure(why.str());
}

// A smoothed sign: x / band clamped to [-1, 1], a linear ramp from -1 to 1 across |x| < band.
double SmoothSign(double x, double band) { return std::clamp(x / band, -1.0, 1.0); }

}  // namespace

class PlantImpl {
 public:
  PlantImpl(const model::RobotModel& model, const PlantOptions& options)
      : model_(model),
        options_(options),
        world_(options.dt_s, options.solver_iterations),
        sensors_(model.sensors, model.control_rate_hz, options.dt_s, options.seed,
                 options.sensor_noise) {
    world_.AddGround(options.terrain, MeshCellFor(model.wheel.radius_m));
    robot_ = BuildRobot(world_, model, options);
    coulomb_band_rad_s_ = MotorCoulombBand(model.motor, model.wheel.spin_inertia_kgm2, options.dt_s);
    const double rolling_Nm = model.wheel.rolling_resistance * model.total_mass_kg() *
                              model::kStandardGravity_m_s2 / 2 * model.wheel.radius_m;
    rolling_band_rad_s_ =
        std::max(1e-3, 2 * rolling_Nm * options.dt_s / model.wheel.spin_inertia_kgm2);
    payload_target_m_ = model.payload.x_m;
    const model::PayloadModel& p = model.payload;
    // Carriage servo: critically damped at 20 Hz, well above the balance dynamics, so the payload
    // rides with the deck unless commanded (common practice for a stiff position loop; stable
    // at the physics step while ω·dt ≪ 2).
    const double omega = 2 * std::numbers::pi * 20.0;
    payload_stiffness_N_m_ = p.mass_kg * omega * omega;
    payload_damping_N_s_m_ = 2 * p.mass_kg * omega;
    pushes_.reserve(16);
    motor_faults_.reserve(16);
    UpdateReadouts();
  }

  void Step() {
    if (diverged_) return;
    btMultiBody* body = robot_.body;
    for (int i : {kLeftWheelLink, kRightWheelLink}) {
      const auto side = static_cast<size_t>(i);
      motors_[side] = EvaluateMotor(model_.motor, options_.drive, command_[side],
                                    body->getJointVel(i), coulomb_band_rad_s_,
                                    TorqueScale(i == kLeftWheelLink ? MotorSide::kLeft
                                                                    : MotorSide::kRight));
      body->addJointTorque(i, motors_[side].wheel_torque_Nm);
      // Rolling resistance: a torque against the wheel's absolute spin, reacted by the ground.
      const double rolling_Nm = model_.wheel.rolling_resistance *
                                contact_.wheels[side].normal_N * model_.wheel.radius_m;
      if (rolling_Nm > 0) {
        body->addLinkTorque(i, -rolling_Nm * SmoothSign(wheel_spin_[side], rolling_band_rad_s_) *
                                   axle_world_);
      }
    }
    ApplyPushes();
    if (robot_.has_payload) {
      const double q = body->getJointPos(kPayloadLink), qd = body->getJointVel(kPayloadLink);
      body->addJointTorque(kPayloadLink, payload_stiffness_N_m_ * (payload_target_m_ - q) -
                                             payload_damping_N_s_m_ * qd);
    }
    world_.Step();
    ++step_;
    UpdateReadouts();
  }

  Status AddPush(const Push& push) {
    if (Status valid = push.Validate(); !valid) return valid;
    pushes_.push_back(push);
    return {};
  }

  Status AddMotorFault(const MotorFault& fault) {
    if (Status valid = fault.Validate(); !valid) return valid;
    motor_faults_.push_back({fault, FirstStepAtOrAfter(fault.start_s, options_.dt_s)});
    return {};
  }

  Status AddSensorFault(const SensorFault& fault) {
    if (Status valid = fault.Validate(); !valid) return valid;
    sensors_.AddFault(fault);
    return {};
  }

  void SetCommand(double left, double right) { command_ = {left, right}; }
  void SetPayloadTarget(double x_m) {
    payload_target_m_ = std::clamp(x_m, model_.payload.min_x_m, model_.payload.max_x_m);
  }
  SensorSample Sense() const { return sensors_.Read(step_); }

  const model::RobotModel model_;
  const PlantOptions options_;
  World world_;
  RobotBody robot_;
  SensorPipeline sensors_;
  long step_ = 0;
  bool diverged_ = false;
  TrueState truth_;
  MotorState motors_{};
  ContactState contact_;

 private:
  struct TimedMotorFault {
    MotorFault fault;
    long first_step = 0;  // the first physics step it acts on
  };

  // The torque scale of one motor for the step about to be taken: that of the latest started
  // fault on it (the last added among equal starts), 1 when none has started.
  double TorqueScale(MotorSide side) const {
    const TimedMotorFault* acting = nullptr;
    for (const TimedMotorFault& f : motor_faults_) {
      if (step_ < f.first_step || (f.fault.side != side && f.fault.side != MotorSide::kBoth)) {
        continue;
      }
      if (acting == nullptr || f.fault.start_s >= acting->fault.start_s) acting = &f;
    }
    return acting == nullptr ? 1.0 : acting->fault.torque_scale;
  }

  void ApplyPushes() {
    const double t0 = static_cast<double>(step_) * options_.dt_s, t1 = t0 + options_.dt_s;
    btVector3 force(0, 0, 0), torque(0, 0, 0);
    const btTransform& base = robot_.body->getBaseWorldTransform();
    bool acting = false;
    for (const Push& p : pushes_) {
      if (t1 <= p.start_s || t0 >= p.end_s()) continue;
      acting = true;
      const double f = p.MeanForce(t0, t1);
      const double azimuth = p.direction_deg * std::numbers::pi / 180;
      const btVector3 f_world = f * btVector3(std::cos(azimuth), std::sin(azimuth), 0);
      // Applied at height_m above the axle on the chassis's vertical axis.
      const btVector3 arm = base.getBasis() * (robot_.com_to_axle + btVector3(0, 0, p.height_m));
      force += f_world;
      torque += arm.cross(f_world);
    }
    if (!acting) return;
    robot_.body->addBaseForce(force);
    robot_.body->addBaseTorque(torque);
  }

  // Truth, IMU kinematics, contacts and sensor record from the state after the last step.
  void UpdateReadouts() {
    const btMultiBody* body = robot_.body;
    const btTransform& base = body->getBaseWorldTransform();
    const btMatrix3x3& R = base.getBasis();
    const btVector3 v = body->getBaseVel(), w = body->getBaseOmega();
    if (!std::isfinite(v.length2()) || !std::isfinite(w.length2()) ||
        !std::isfinite(base.getOrigin().length2())) {
      diverged_ = true;
      return;
    }
    const btVector3 to_axle = R * robot_.com_to_axle;
    const btVector3 axle = base.getOrigin() + to_axle;
    const btVector3 axle_vel = v + w.cross(to_axle);
    axle_world_ = R.getColumn(1);

    TrueState& s = truth_;
    s.time_s = static_cast<double>(step_) * options_.dt_s;
    s.x_m = axle.x();
    s.y_m = axle.y();
    s.z_m = axle.z();
    // Z-Y-X Euler angles: R = Rz(yaw) Ry(pitch) Rx(roll). The sines and cosines of the angles
    // come from R itself (|pitch| < 90° while the robot is up): no trigonometric call per step
    // beyond the three angles.
    s.pitch_rad = std::asin(std::clamp(-R[2][0], -1.0, 1.0));
    s.yaw_rad = std::atan2(R[1][0], R[0][0]);
    s.roll_rad = std::atan2(R[2][1], R[2][2]);
    const btVector3 wb = R.transpose() * w;  // body-frame rates
    const double cp = std::sqrt(R[2][1] * R[2][1] + R[2][2] * R[2][2]);  // cos pitch
    const double cp_yaw = std::sqrt(R[0][0] * R[0][0] + R[1][0] * R[1][0]);  // cos pitch too
    const double cr = R[2][2] / cp, sr = R[2][1] / cp;
    const double cy = R[0][0] / cp_yaw, sy = R[1][0] / cp_yaw;
    s.pitch_rate_rad_s = cr * wb.y() - sr * wb.z();
    s.yaw_rate_rad_s = (sr * wb.y() + cr * wb.z()) / cp;
    s.roll_rate_rad_s = wb.x() - R[2][0] / cp * (sr * wb.y() + cr * wb.z());
    s.forward_speed_m_s = axle_vel.dot(btVector3(cy, sy, 0));
    s.vertical_speed_m_s = axle_vel.z();
    for (int i : {kLeftWheelLink, kRightWheelLink}) {
      const auto side = static_cast<size_t>(i);
      s.wheel_angle_rad[side] = body->getJointPos(i);
      s.wheel_rate_rad_s[side] = body->getJointVel(i);
      wheel_spin_[side] = w.dot(axle_world_) + s.wheel_rate_rad_s[side];
      const double y = (i == kLeftWheelLink ? 0.5 : -0.5) * model_.wheel.track_m;
      hub_velocity_[side] = v + w.cross(R * (robot_.com_to_axle + btVector3(0, y, 0)));
    }
    if (robot_.has_payload) s.payload_x_m = body->getJointPos(kPayloadLink);

    ReadContacts(world_, robot_, model_.wheel.radius_m, wheel_spin_, hub_velocity_, &contact_);

    // IMU: rate from the body's angular velocity; specific force from the finite difference of
    // the IMU point's velocity over the step (the engine has no acceleration accessor).
    const model::SensorModel& sm = model_.sensors;
    const btVector3 imu_arm = R * (robot_.com_to_axle + btVector3(sm.imu_x_m, sm.imu_y_m, sm.imu_z_m));
    const btVector3 imu_vel = v + w.cross(imu_arm);
    const btVector3 accel =
        step_ == 0 ? btVector3(0, 0, 0) : (imu_vel - imu_vel_prev_) / options_.dt_s;
    imu_vel_prev_ = imu_vel;
    const btVector3 specific =
        R.transpose() * (accel + btVector3(0, 0, model::kStandardGravity_m_s2));
    Measurement m;
    m.gyro_rad_s = {wb.x(), wb.y(), wb.z()};
    m.accel_m_s2 = {specific.x(), specific.y(), specific.z()};
    m.wheel_angle_rad = s.wheel_angle_rad;
    sensors_.Record(step_, m);
  }

  std::array<double, 2> command_{};
  std::vector<Push> pushes_;
  std::vector<TimedMotorFault> motor_faults_;
  double payload_target_m_ = 0;
  double payload_stiffness_N_m_ = 0, payload_damping_N_s_m_ = 0;
  double coulomb_band_rad_s_ = 0, rolling_band_rad_s_ = 0;
  btVector3 axle_world_{0, 1, 0};
  btVector3 imu_vel_prev_{0, 0, 0};
  std::array<double, 2> wheel_spin_{};
  std::array<btVector3, 2> hub_velocity_{};
};

}  // namespace internal

Result<std::unique_ptr<Plant>> Plant::Create(const model::RobotModel& model,
                                             const PlantOptions& options) {
  if (const auto valid_model = model::ValidateModel(model); !valid_model) {
    return Failure("robot model: " + valid_model.error().front());
  }
  if (Status valid = options.Validate(); !valid) return Failure(valid.error());
  if (Status fits = internal::CheckModelAgainstOptions(model, options); !fits) {
    return Failure(fits.error());
  }
  return std::unique_ptr<Plant>(new Plant(std::make_unique<internal::PlantImpl>(model, options)));
}

Plant::Plant(std::unique_ptr<internal::PlantImpl> impl) : impl_(std::move(impl)) {}
Plant::~Plant() = default;

void Plant::SetCommand(double left, double right) { impl_->SetCommand(left, right); }
Status Plant::AddPush(const Push& push) { return impl_->AddPush(push); }
Status Plant::AddMotorFault(const MotorFault& fault) { return impl_->AddMotorFault(fault); }
Status Plant::AddSensorFault(const SensorFault& fault) { return impl_->AddSensorFault(fault); }
void Plant::SetPayloadTarget(double x_m) { impl_->SetPayloadTarget(x_m); }
void Plant::Step() { impl_->Step(); }
double Plant::time_s() const { return impl_->truth_.time_s; }
long Plant::step_count() const { return impl_->step_; }
const TrueState& Plant::truth() const { return impl_->truth_; }
SensorSample Plant::Sense() const { return impl_->Sense(); }
const MotorState& Plant::motors() const { return impl_->motors_; }
const ContactState& Plant::contact() const { return impl_->contact_; }
const model::RobotModel& Plant::model() const { return impl_->model_; }
const PlantOptions& Plant::options() const { return impl_->options_; }
bool Plant::diverged() const { return impl_->diverged_; }

}  // namespace upright::sim
