#include "model_schema.hpp"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <utility>

#include "upright/base/number_text.hpp"
#include "upright/model/edge_compare.hpp"
#include "upright/model/model_file.hpp"
#include "upright/model/seconds_hint.hpp"

namespace upright::model::internal {
namespace {

constexpr Limit Above(double value) { return {Bound::kOpen, value}; }
constexpr Limit AtLeast(double value) { return {Bound::kClosed, value}; }
constexpr Limit Below(double value) { return {Bound::kOpen, value}; }
constexpr Limit AtMost(double value) { return {Bound::kClosed, value}; }

// Uniform solid block about its centre: I = m(a² + b²)/12 over the two sides across the axis
// (handbook, from memory).
double BlockInertia(double mass_kg, double a_m, double b_m) {
  return mass_kg * (a_m * a_m + b_m * b_m) / 12.0;
}

double PitchFromBlock(const ModelDraft& d) {
  return BlockInertia(d.model.chassis.mass_kg, d.block_length_m, d.block_height_m);
}
double RollFromBlock(const ModelDraft& d) {
  return BlockInertia(d.model.chassis.mass_kg, d.block_width_m, d.block_height_m);
}
double YawFromBlock(const ModelDraft& d) {
  return BlockInertia(d.model.chassis.mass_kg, d.block_length_m, d.block_width_m);
}

// Uniform disc about its axis: ½ m r² (handbook, from memory).
double SpinOfUniformDisc(const ModelDraft& d) {
  const WheelModel& w = d.model.wheel;
  return 0.5 * w.mass_kg * w.radius_m * w.radius_m;
}

// Uniform solid cylinder about a diameter: m(3r² + w²)/12 (handbook, from memory).
double DiameterOfUniformCylinder(const ModelDraft& d) {
  const WheelModel& w = d.model.wheel;
  return w.mass_kg * (3 * w.radius_m * w.radius_m + w.width_m * w.width_m) / 12.0;
}

constexpr ElementRule kElementRules[] = {
    {.path = "chassis",
     .meaning = "the body: everything rigidly joined, without wheels or payload"},
    {.path = "chassis/principal_moments",
     .occurs = Occurs::kOneOf,
     .group = "chassis inertia",
     .meaning = "principal moments of inertia about the chassis COM"},
    {.path = "chassis/uniform_block",
     .occurs = Occurs::kOneOf,
     .group = "chassis inertia",
     .meaning = "a uniform solid block centred on the COM, from which the moments follow"},
    {.path = "chassis/outline",
     .meaning = "the box whose touching the ground means a fall; also the collision shape"},
    {.path = "wheels", .meaning = "one wheel (both are alike) and the track between them"},
    {.path = "motor", .meaning = "one DC motor and gearbox (one per wheel, both alike)"},
    {.path = "sensors", .meaning = "what the controller measures, and how late"},
    {.path = "sensors/imu", .meaning = "where the inertial unit sits and how often it samples"},
    {.path = "sensors/gyro",
     .occurs = Occurs::kOptional,
     .meaning = "gyro errors; absent means an ideal gyro"},
    {.path = "sensors/accelerometer",
     .occurs = Occurs::kOptional,
     .meaning = "accelerometer errors; absent means an ideal accelerometer"},
    {.path = "sensors/encoder", .meaning = "wheel encoders (angle of the wheel to the chassis)"},
    {.path = "control", .meaning = "the balance controller's sample rate"},
    {.path = "payload",
     .occurs = Occurs::kOptional,
     .present = [](RobotModel& m) { return &m.payload.present; },
     .meaning = "a box carried on the deck that can slide along x between travel limits"},
};

constexpr FieldRule kFieldRules[] = {
    // <chassis>
    {.element = "chassis",
     .attribute = "mass_kg",
     .unit = "kg",
     .field = [](ModelDraft& d) { return &d.model.chassis.mass_kg; },
     .required = true,
     .min = Above(0),
     .max = AtMost(1000),
     .meaning = "chassis mass"},
    {.element = "chassis",
     .attribute = "com_height_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.chassis.com_height_m; },
     .required = true,
     .min = Above(0),
     .max = AtMost(5),
     .meaning = "centre of mass above the axle, upright"},
    {.element = "chassis",
     .attribute = "com_forward_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.chassis.com_forward_m; },
     .meaning = "centre of mass ahead of the axle, upright"},
    // <chassis><principal_moments>
    {.element = "chassis/principal_moments",
     .attribute = "pitch_kgm2",
     .unit = "kg·m²",
     .field = [](ModelDraft& d) { return &d.model.chassis.pitch_inertia_kgm2; },
     .required = true,
     .derive = PitchFromBlock,
     .default_text = "required; from `<uniform_block>` when that is given instead",
     .min = Above(0),
     .meaning = "about the body y axis through the COM"},
    {.element = "chassis/principal_moments",
     .attribute = "roll_kgm2",
     .unit = "kg·m²",
     .field = [](ModelDraft& d) { return &d.model.chassis.roll_inertia_kgm2; },
     .required = true,
     .derive = RollFromBlock,
     .default_text = "required; from `<uniform_block>` when that is given instead",
     .min = Above(0),
     .meaning = "about the body x axis through the COM"},
    {.element = "chassis/principal_moments",
     .attribute = "yaw_kgm2",
     .unit = "kg·m²",
     .field = [](ModelDraft& d) { return &d.model.chassis.yaw_inertia_kgm2; },
     .required = true,
     .derive = YawFromBlock,
     .default_text = "required; from `<uniform_block>` when that is given instead",
     .min = Above(0),
     .meaning = "about the body z axis through the COM"},
    // <chassis><uniform_block>
    {.element = "chassis/uniform_block",
     .attribute = "length_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.block_length_m; },
     .required = true,
     .min = Above(0),
     .max = AtMost(10),
     .file_only = true,
     .meaning = "along x; pitch = m(l² + h²)/12, yaw = m(l² + w²)/12"},
    {.element = "chassis/uniform_block",
     .attribute = "width_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.block_width_m; },
     .required = true,
     .min = Above(0),
     .max = AtMost(10),
     .file_only = true,
     .meaning = "along y; roll = m(w² + h²)/12"},
    {.element = "chassis/uniform_block",
     .attribute = "height_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.block_height_m; },
     .required = true,
     .min = Above(0),
     .max = AtMost(10),
     .file_only = true,
     .meaning = "along z"},
    // <chassis><outline>
    {.element = "chassis/outline",
     .attribute = "front_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.chassis.outline_front_m; },
     .required = true,
     .meaning = "x of the front face"},
    {.element = "chassis/outline",
     .attribute = "rear_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.chassis.outline_rear_m; },
     .required = true,
     .meaning = "x of the rear face"},
    {.element = "chassis/outline",
     .attribute = "bottom_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.chassis.outline_bottom_m; },
     .required = true,
     .meaning = "z of the bottom face; negative when it hangs below the axle"},
    {.element = "chassis/outline",
     .attribute = "top_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.chassis.outline_top_m; },
     .required = true,
     .meaning = "z of the top face"},
    {.element = "chassis/outline",
     .attribute = "width_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.chassis.outline_width_m; },
     .required = true,
     .min = Above(0),
     .max = AtMost(10),
     .meaning = "extent along y, centred"},
    // <wheels>
    {.element = "wheels",
     .attribute = "radius_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.wheel.radius_m; },
     .required = true,
     .min = Above(0),
     .max = AtMost(2),
     .meaning = "rolling radius"},
    {.element = "wheels",
     .attribute = "width_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.wheel.width_m; },
     .required = true,
     .min = Above(0),
     .max = AtMost(1),
     .meaning = "tyre width"},
    {.element = "wheels",
     .attribute = "mass_kg",
     .unit = "kg",
     .field = [](ModelDraft& d) { return &d.model.wheel.mass_kg; },
     .required = true,
     .min = Above(0),
     .max = AtMost(100),
     .meaning = "one wheel with its hub"},
    {.element = "wheels",
     .attribute = "spin_inertia_kgm2",
     .unit = "kg·m²",
     .field = [](ModelDraft& d) { return &d.model.wheel.spin_inertia_kgm2; },
     .derive = SpinOfUniformDisc,
     .default_text = "½ m r² (uniform disc)",
     .min = Above(0),
     .meaning = "one wheel about the axle"},
    {.element = "wheels",
     .attribute = "diameter_inertia_kgm2",
     .unit = "kg·m²",
     .field = [](ModelDraft& d) { return &d.model.wheel.diameter_inertia_kgm2; },
     .derive = DiameterOfUniformCylinder,
     .default_text = "m(3r² + w²)/12 (uniform cylinder)",
     .min = Above(0),
     .meaning = "one wheel about a diameter through its centre"},
    {.element = "wheels",
     .attribute = "track_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.wheel.track_m; },
     .required = true,
     .min = Above(0),
     .max = AtMost(5),
     .meaning = "distance between the two wheel mid-planes"},
    {.element = "wheels",
     .attribute = "friction",
     .unit = "—",
     .field = [](ModelDraft& d) { return &d.model.wheel.friction; },
     .required = true,
     .min = Above(0),
     .max = AtMost(3),
     .meaning = "tyre–ground Coulomb friction coefficient on dry ground"},
    {.element = "wheels",
     .attribute = "rolling_resistance",
     .unit = "—",
     .field = [](ModelDraft& d) { return &d.model.wheel.rolling_resistance; },
     .min = AtLeast(0),
     .max = AtMost(0.5),
     .meaning = "coefficient C_rr: resisting torque C_rr · N · r"},
    // <motor>
    {.element = "motor",
     .attribute = "torque_constant_Nm_per_A",
     .unit = "N·m/A",
     .field = [](ModelDraft& d) { return &d.model.motor.torque_constant_Nm_per_A; },
     .required = true,
     .min = Above(0),
     .max = AtMost(100),
     .meaning = "K_t at the motor shaft"},
    {.element = "motor",
     .attribute = "back_emf_V_s_per_rad",
     .unit = "V·s/rad",
     .field = [](ModelDraft& d) { return &d.model.motor.back_emf_V_s_per_rad; },
     .required = true,
     .min = Above(0),
     .max = AtMost(100),
     .meaning = "K_e at the motor shaft (equals K_t in SI for an ideal motor)"},
    {.element = "motor",
     .attribute = "resistance_ohm",
     .unit = "Ω",
     .field = [](ModelDraft& d) { return &d.model.motor.resistance_ohm; },
     .required = true,
     .min = Above(0),
     .max = AtMost(1000),
     .meaning = "terminal resistance; inductance is neglected"},
    {.element = "motor",
     .attribute = "gear_ratio",
     .unit = "—",
     .field = [](ModelDraft& d) { return &d.model.motor.gear_ratio; },
     .required = true,
     .min = AtLeast(1),
     .max = AtMost(1000),
     .meaning = "motor speed / wheel speed"},
    {.element = "motor",
     .attribute = "gear_efficiency",
     .unit = "—",
     .field = [](ModelDraft& d) { return &d.model.motor.gear_efficiency; },
     .default_value = 1,
     .min = Above(0),
     .max = AtMost(1),
     .meaning = "multiplies the torque through the gearbox"},
    {.element = "motor",
     .attribute = "supply_V",
     .unit = "V",
     .field = [](ModelDraft& d) { return &d.model.motor.supply_V; },
     .required = true,
     .min = Above(0),
     .max = AtMost(1000),
     .meaning = "largest terminal voltage magnitude"},
    {.element = "motor",
     .attribute = "current_limit_A",
     .unit = "A",
     .field = [](ModelDraft& d) { return &d.model.motor.current_limit_A; },
     .required = true,
     .min = Above(0),
     .max = AtMost(1000),
     .meaning = "the drive's current limit magnitude"},
    {.element = "motor",
     .attribute = "viscous_friction_Nm_s_per_rad",
     .unit = "N·m·s/rad",
     .field = [](ModelDraft& d) { return &d.model.motor.viscous_friction_Nm_s_per_rad; },
     .min = AtLeast(0),
     .meaning = "at the wheel, per rad/s of wheel speed relative to the chassis"},
    {.element = "motor",
     .attribute = "coulomb_friction_Nm",
     .unit = "N·m",
     .field = [](ModelDraft& d) { return &d.model.motor.coulomb_friction_Nm; },
     .min = AtLeast(0),
     .meaning = "Coulomb friction torque at the wheel"},
    // <sensors>
    {.element = "sensors",
     .attribute = "latency_s",
     .unit = "s",
     .field = [](ModelDraft& d) { return &d.model.sensors.latency_s; },
     .min = AtLeast(0),
     .max = Below(0.5),
     .meaning = "from measurement to the controller's input, rounded to whole physics steps"},
    {.element = "sensors/imu",
     .attribute = "rate_hz",
     .unit = "Hz",
     .field = [](ModelDraft& d) { return &d.model.sensors.imu_rate_hz; },
     .required = true,
     .min = AtLeast(1),
     .max = AtMost(100000),
     .meaning = "the IMU's own sample rate"},
    {.element = "sensors/imu",
     .attribute = "x_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.sensors.imu_x_m; },
     .required = true,
     .meaning = "IMU position, body frame"},
    {.element = "sensors/imu",
     .attribute = "y_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.sensors.imu_y_m; },
     .required = true,
     .meaning = "IMU position, body frame"},
    {.element = "sensors/imu",
     .attribute = "z_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.sensors.imu_z_m; },
     .required = true,
     .meaning = "IMU position, body frame"},
    {.element = "sensors/gyro",
     .attribute = "noise_rad_s_rthz",
     .unit = "rad/s/√Hz",
     .field = [](ModelDraft& d) { return &d.model.sensors.gyro_noise_rad_s_rthz; },
     .min = AtLeast(0),
     .max = AtMost(1),
     .meaning = "white-noise density"},
    {.element = "sensors/gyro",
     .attribute = "bias_x_rad_s",
     .unit = "rad/s",
     .field = [](ModelDraft& d) { return &d.model.sensors.gyro_bias_x_rad_s; },
     .min = AtLeast(-1),
     .max = AtMost(1),
     .meaning = "constant bias, body x"},
    {.element = "sensors/gyro",
     .attribute = "bias_y_rad_s",
     .unit = "rad/s",
     .field = [](ModelDraft& d) { return &d.model.sensors.gyro_bias_y_rad_s; },
     .min = AtLeast(-1),
     .max = AtMost(1),
     .meaning = "constant bias, body y"},
    {.element = "sensors/gyro",
     .attribute = "bias_z_rad_s",
     .unit = "rad/s",
     .field = [](ModelDraft& d) { return &d.model.sensors.gyro_bias_z_rad_s; },
     .min = AtLeast(-1),
     .max = AtMost(1),
     .meaning = "constant bias, body z"},
    {.element = "sensors/gyro",
     .attribute = "resolution_rad_s",
     .unit = "rad/s",
     .field = [](ModelDraft& d) { return &d.model.sensors.gyro_resolution_rad_s; },
     .min = AtLeast(0),
     .max = AtMost(1),
     .meaning = "quantisation step; 0 = none"},
    {.element = "sensors/accelerometer",
     .attribute = "noise_m_s2_rthz",
     .unit = "m/s²/√Hz",
     .field = [](ModelDraft& d) { return &d.model.sensors.accel_noise_m_s2_rthz; },
     .min = AtLeast(0),
     .max = AtMost(10),
     .meaning = "white-noise density"},
    {.element = "sensors/accelerometer",
     .attribute = "bias_x_m_s2",
     .unit = "m/s²",
     .field = [](ModelDraft& d) { return &d.model.sensors.accel_bias_x_m_s2; },
     .min = AtLeast(-10),
     .max = AtMost(10),
     .meaning = "constant bias, body x"},
    {.element = "sensors/accelerometer",
     .attribute = "bias_y_m_s2",
     .unit = "m/s²",
     .field = [](ModelDraft& d) { return &d.model.sensors.accel_bias_y_m_s2; },
     .min = AtLeast(-10),
     .max = AtMost(10),
     .meaning = "constant bias, body y"},
    {.element = "sensors/accelerometer",
     .attribute = "bias_z_m_s2",
     .unit = "m/s²",
     .field = [](ModelDraft& d) { return &d.model.sensors.accel_bias_z_m_s2; },
     .min = AtLeast(-10),
     .max = AtMost(10),
     .meaning = "constant bias, body z"},
    {.element = "sensors/accelerometer",
     .attribute = "resolution_m_s2",
     .unit = "m/s²",
     .field = [](ModelDraft& d) { return &d.model.sensors.accel_resolution_m_s2; },
     .min = AtLeast(0),
     .max = AtMost(10),
     .meaning = "quantisation step; 0 = none"},
    {.element = "sensors/encoder",
     .attribute = "counts_per_rev",
     .unit = "counts",
     .field = [](ModelDraft& d) { return &d.model.sensors.encoder_counts_per_rev; },
     .required = true,
     .min = AtLeast(1),
     .max = AtMost(1e9),
     .whole = true,
     .meaning = "counts per wheel revolution (after any gearbox)"},
    // <control>
    {.element = "control",
     .attribute = "rate_hz",
     .unit = "Hz",
     .field = [](ModelDraft& d) { return &d.model.control_rate_hz; },
     .required = true,
     .min = AtLeast(1),
     .max = AtMost(100000),
     .meaning = "the rate the balance controller runs at"},
    // <payload>
    {.element = "payload",
     .attribute = "mass_kg",
     .unit = "kg",
     .field = [](ModelDraft& d) { return &d.model.payload.mass_kg; },
     .required = true,
     .min = Above(0),
     .max = AtMost(1000),
     .meaning = "payload mass"},
    {.element = "payload",
     .attribute = "length_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.payload.length_m; },
     .required = true,
     .min = Above(0),
     .max = AtMost(10),
     .meaning = "box size along x"},
    {.element = "payload",
     .attribute = "width_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.payload.width_m; },
     .required = true,
     .min = Above(0),
     .max = AtMost(10),
     .meaning = "box size along y"},
    {.element = "payload",
     .attribute = "height_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.payload.height_m; },
     .required = true,
     .min = Above(0),
     .max = AtMost(10),
     .meaning = "box size along z"},
    {.element = "payload",
     .attribute = "x_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.payload.x_m; },
     .required = true,
     .meaning = "home position of the box centre, body x"},
    {.element = "payload",
     .attribute = "z_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.payload.z_m; },
     .required = true,
     .meaning = "height of the box centre above the axle"},
    {.element = "payload",
     .attribute = "min_x_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.payload.min_x_m; },
     .required = true,
     .meaning = "rear travel limit of the box centre"},
    {.element = "payload",
     .attribute = "max_x_m",
     .unit = "m",
     .field = [](ModelDraft& d) { return &d.model.payload.max_x_m; },
     .required = true,
     .meaning = "front travel limit of the box centre"},
};

std::string F(double value) { return WholeOrShortestText(value); }

// Geometric comparisons of file values (edge_compare.hpp): the scale is the sum of the magnitudes
// that enter the comparison, so a value exactly on an edge is judged as on it despite rounding.
bool AtMost(double value, double limit) {
  return NoMoreThan(value, limit, std::abs(value) + std::abs(limit));
}
bool Under(double value, double limit) {
  return LessThan(value, limit, std::abs(value) + std::abs(limit));
}
// lo <= value <= hi.
bool Within(double lo, double value, double hi) { return AtMost(lo, value) && AtMost(value, hi); }

// Rules that place things inside the outline wait until the outline itself is right, so that one
// slip gives one message.
bool OutlineIsBox(const ChassisModel& c) {
  return Under(c.outline_rear_m, c.outline_front_m) && Under(c.outline_bottom_m, c.outline_top_m);
}

constexpr CrossRule kCrossRules[] = {
    {"chassis/outline", "`front_m` > `rear_m`",
     [](const RobotModel& m) -> Status {
       const ChassisModel& c = m.chassis;
       if (Under(c.outline_rear_m, c.outline_front_m)) return {};
       return Failure("chassis/outline front_m = " + F(c.outline_front_m) +
                      ", rear_m = " + F(c.outline_rear_m) + ": front_m must be > rear_m");
     }},
    {"chassis/outline", "`top_m` > `bottom_m`",
     [](const RobotModel& m) -> Status {
       const ChassisModel& c = m.chassis;
       if (Under(c.outline_bottom_m, c.outline_top_m)) return {};
       return Failure("chassis/outline top_m = " + F(c.outline_top_m) +
                      ", bottom_m = " + F(c.outline_bottom_m) + ": top_m must be > bottom_m");
     }},
    {"chassis/outline", "`bottom_m` > −`wheels radius_m`: the chassis clears the ground upright",
     [](const RobotModel& m) -> Status {
       if (Under(-m.wheel.radius_m, m.chassis.outline_bottom_m)) return {};
       return Failure("chassis/outline bottom_m = " + F(m.chassis.outline_bottom_m) +
                      ": must be > -(wheels radius_m) = " + F(-m.wheel.radius_m) +
                      " so the chassis clears the ground when upright");
     }},
    {"chassis", "the COM (`com_forward_m`, `com_height_m`) lies inside the outline",
     [](const RobotModel& m) -> Status {
       const ChassisModel& c = m.chassis;
       if (!OutlineIsBox(c)) return {};
       if (Within(c.outline_rear_m, c.com_forward_m, c.outline_front_m) &&
           Within(c.outline_bottom_m, c.com_height_m, c.outline_top_m)) {
         return {};
       }
       return Failure("chassis com_forward_m = " + F(c.com_forward_m) +
                      ", com_height_m = " + F(c.com_height_m) +
                      ": the centre of mass must lie inside chassis/outline (x in [" +
                      F(c.outline_rear_m) + ", " + F(c.outline_front_m) + "], z in [" +
                      F(c.outline_bottom_m) + ", " + F(c.outline_top_m) + "])");
     }},
    {"chassis/principal_moments",
     "each principal moment ≤ the sum of the other two (true of every rigid body)",
     [](const RobotModel& m) -> Status {
       const double p = m.chassis.pitch_inertia_kgm2;
       const double r = m.chassis.roll_inertia_kgm2;
       const double y = m.chassis.yaw_inertia_kgm2;
       const double sum = p + r + y;  // the scale of each comparison
       if (NoMoreThan(p, r + y, sum) && NoMoreThan(r, p + y, sum) && NoMoreThan(y, p + r, sum)) {
         return {};
       }
       return Failure(
           "chassis/principal_moments pitch_kgm2 = " + F(p) + ", roll_kgm2 = " + F(r) +
           ", yaw_kgm2 = " + F(y) +
           ": each moment must be <= the sum of the other two (no rigid body has these)");
     }},
    {"wheels", "`width_m` < `track_m`",
     [](const RobotModel& m) -> Status {
       if (Under(m.wheel.width_m, m.wheel.track_m)) return {};
       return Failure("wheels width_m = " + F(m.wheel.width_m) +
                      ", track_m = " + F(m.wheel.track_m) + ": width_m must be < track_m");
     }},
    {"wheels", "`spin_inertia_kgm2` ≤ 2 × `diameter_inertia_kgm2` (principal moments of a wheel)",
     [](const RobotModel& m) -> Status {
       const double spin = m.wheel.spin_inertia_kgm2;
       const double diameter = m.wheel.diameter_inertia_kgm2;
       if (AtMost(spin, 2 * diameter)) return {};
       return Failure(
           "wheels spin_inertia_kgm2 = " + F(spin) + ", diameter_inertia_kgm2 = " + F(diameter) +
           ": spin_inertia_kgm2 must be <= 2 * diameter_inertia_kgm2 (no rigid wheel has "
           "these)");
     }},
    {"sensors", "`latency_s` < 50 control periods (50 / `control rate_hz`)",
     [](const RobotModel& m) -> Status {
       const double bound_s = kMaxLatencyControlPeriods / m.control_rate_hz;
       if (Under(m.sensors.latency_s, bound_s)) return {};
       return Failure("sensors latency_s = " + F(m.sensors.latency_s) + ": must be < " +
                      F(kMaxLatencyControlPeriods) + " control periods = " + F(bound_s) + " s; " +
                      SecondsHint(m.sensors.latency_s));
     }},
    {"sensors/imu", "the IMU position lies inside the outline",
     [](const RobotModel& m) -> Status {
       const ChassisModel& c = m.chassis;
       const SensorModel& s = m.sensors;
       if (!OutlineIsBox(c)) return {};
       if (Within(c.outline_rear_m, s.imu_x_m, c.outline_front_m) &&
           AtMost(std::abs(s.imu_y_m), 0.5 * c.outline_width_m) &&
           Within(c.outline_bottom_m, s.imu_z_m, c.outline_top_m)) {
         return {};
       }
       return Failure("sensors/imu x_m = " + F(s.imu_x_m) + ", y_m = " + F(s.imu_y_m) +
                      ", z_m = " + F(s.imu_z_m) +
                      ": the IMU must lie inside chassis/outline (x in [" + F(c.outline_rear_m) +
                      ", " + F(c.outline_front_m) + "], |y| <= " + F(0.5 * c.outline_width_m) +
                      ", z in [" + F(c.outline_bottom_m) + ", " + F(c.outline_top_m) + "])");
     }},
    {"sensors/imu", "`rate_hz` ≥ `control rate_hz`",
     [](const RobotModel& m) -> Status {
       if (m.sensors.imu_rate_hz >= m.control_rate_hz) return {};
       return Failure("sensors/imu rate_hz = " + F(m.sensors.imu_rate_hz) +
                      ": must be >= control rate_hz = " + F(m.control_rate_hz));
     }},
    {"payload", "`min_x_m` ≤ `x_m` ≤ `max_x_m`",
     [](const RobotModel& m) -> Status {
       const PayloadModel& p = m.payload;
       if (!p.present || Within(p.min_x_m, p.x_m, p.max_x_m)) return {};
       return Failure("payload min_x_m = " + F(p.min_x_m) + ", x_m = " + F(p.x_m) +
                      ", max_x_m = " + F(p.max_x_m) + ": must be min_x_m <= x_m <= max_x_m");
     }},
    {"payload",
     "the box stays within the outline's length at both travel limits: "
     "`min_x_m` − `length_m`/2 ≥ `rear_m`, `max_x_m` + `length_m`/2 ≤ `front_m`",
     [](const RobotModel& m) -> Status {
       const PayloadModel& p = m.payload;
       const double rear_end_m = p.min_x_m - 0.5 * p.length_m;
       const double front_end_m = p.max_x_m + 0.5 * p.length_m;
       const double half_m = 0.5 * p.length_m;
       const double rear_m = m.chassis.outline_rear_m, front_m = m.chassis.outline_front_m;
       if (!p.present || !OutlineIsBox(m.chassis) ||
           (NoMoreThan(rear_m, rear_end_m, std::abs(p.min_x_m) + half_m + std::abs(rear_m)) &&
            NoMoreThan(front_end_m, front_m, std::abs(p.max_x_m) + half_m + std::abs(front_m)))) {
         return {};
       }
       return Failure("payload min_x_m = " + F(p.min_x_m) + ", max_x_m = " + F(p.max_x_m) +
                      ", length_m = " + F(p.length_m) + ": the box spans x in [" + F(rear_end_m) +
                      ", " + F(front_end_m) +
                      "] over its travel; must stay within chassis/outline [" +
                      F(m.chassis.outline_rear_m) + ", " + F(m.chassis.outline_front_m) + "]");
     }},
    {"payload", "the box lies above the outline's bottom: `z_m` − `height_m`/2 ≥ `bottom_m`",
     [](const RobotModel& m) -> Status {
       const PayloadModel& p = m.payload;
       const double underside_m = p.z_m - 0.5 * p.height_m;
       const double bottom_m = m.chassis.outline_bottom_m;
       if (!p.present || !OutlineIsBox(m.chassis) ||
           NoMoreThan(bottom_m, underside_m,
                      std::abs(p.z_m) + 0.5 * p.height_m + std::abs(bottom_m))) {
         return {};
       }
       return Failure("payload z_m = " + F(p.z_m) + ", height_m = " + F(p.height_m) +
                      ": the box underside at z = " + F(underside_m) +
                      " must be >= chassis/outline bottom_m = " + F(m.chassis.outline_bottom_m));
     }},
};

// The plant samples the IMU, and the controller host runs the controller, every whole number of
// physics steps; both refuse a period off a whole number by 1e-6 of itself or more (so here too).
double StepsAtDefault(double rate_hz) { return 1 / (rate_hz * kDefaultPhysicsStep_s); }
bool IsWholeSteps(double steps) { return std::abs(steps - std::round(steps)) < 1e-6 * steps; }
// The rate whose period is n default physics steps, and how a message offers it.
std::string RateOfSteps(double n) {
  return F(1 / (n * kDefaultPhysicsStep_s)) + " would work (" + F(n) +
         (n == 1 ? " step)" : " steps)");
}
// "its period is 2.5 physics steps of the default dt_s = 0.001 s", the steps to six digits.
std::string PeriodText(double steps) {
  return "its period is " + SignificantText(steps, 6) +
         " physics steps of the default dt_s = " + F(kDefaultPhysicsStep_s) + " s";
}

constexpr StepRule kStepRules[] = {
    {"sensors/imu",
     "the IMU period is a whole number of default physics steps (`rate_hz` = 1000 / n: 1000, "
     "500, 250, 200, …), or the IMU samples at least once a step (`rate_hz` ≥ 1000)",
     [](const RobotModel& m) -> Status {
       const double rate_hz = m.sensors.imu_rate_hz;
       const double steps = StepsAtDefault(rate_hz);
       if (rate_hz * kDefaultPhysicsStep_s >= 1 || IsWholeSteps(steps)) return {};
       // The nearest faster rate keeps the IMU at least as fast as the controller.
       return Failure(
           "sensors/imu rate_hz = " + F(rate_hz) + ": " + PeriodText(steps) +
           "; it must be a whole number of them, or the IMU at least as fast as the physics "
           "(rate_hz >= " +
           F(1 / kDefaultPhysicsStep_s) + "); " + RateOfSteps(std::floor(steps)));
     }},
    {"control",
     "the control period is a whole number (≥ 1) of default physics steps (`rate_hz` = 1000 / n: "
     "1000, 500, 250, 200, …)",
     [](const RobotModel& m) -> Status {
       const double rate_hz = m.control_rate_hz;
       const double steps = StepsAtDefault(rate_hz);
       if (steps >= 1 && IsWholeSteps(steps)) return {};
       // The nearest faster rate: an IMU that keeps this rule keeps up with it too.
       return Failure("control rate_hz = " + F(rate_hz) + ": " + PeriodText(steps) +
                      "; it must be a whole number (>= 1) of them; " +
                      RateOfSteps(std::max(1.0, std::floor(steps))));
     }},
};

std::string LimitText(const Limit& limit, bool lower) {
  std::string text(lower ? (limit.bound == Bound::kOpen ? "> " : ">= ")
                         : (limit.bound == Bound::kOpen ? "< " : "<= "));
  return text + WholeOrShortestText(limit.value);
}

// "(0, 1]", "> 0", "<= 3", or "" when neither bound is set.
std::string BoundsText(const FieldRule& rule) {
  const bool has_min = rule.min.bound != Bound::kNone;
  const bool has_max = rule.max.bound != Bound::kNone;
  if (has_min && has_max) {
    std::string text(rule.min.bound == Bound::kOpen ? "(" : "[");
    text += WholeOrShortestText(rule.min.value);
    text += ", ";
    text += WholeOrShortestText(rule.max.value);
    text += rule.max.bound == Bound::kOpen ? ")" : "]";
    return text;
  }
  if (has_min) return LimitText(rule.min, true);
  if (has_max) return LimitText(rule.max, false);
  return "";
}

bool Keeps(const Limit& limit, double value, bool lower) {
  switch (limit.bound) {
    case Bound::kNone:
      return true;
    case Bound::kOpen:
      return lower ? value > limit.value : value < limit.value;
    case Bound::kClosed:
      return lower ? value >= limit.value : value <= limit.value;
  }
  return false;
}

}  // namespace

std::span<const ElementRule> ElementRules() { return kElementRules; }
std::span<const FieldRule> FieldRules() { return kFieldRules; }
std::span<const CrossRule> CrossRules() { return kCrossRules; }
std::span<const StepRule> StepRules() { return kStepRules; }

const ElementRule* FindElementRule(std::string_view path) {
  for (const ElementRule& rule : kElementRules) {
    if (rule.path == path) return &rule;
  }
  return nullptr;
}

Status CheckField(const FieldRule& rule, double value) {
  const std::string lead = std::string(rule.element) + " " + std::string(rule.attribute) + " = " +
                           WholeOrShortestText(value) + ": ";
  const bool in_bounds = Keeps(rule.min, value, true) && Keeps(rule.max, value, false);
  if (!in_bounds) {
    const bool two_sided = rule.min.bound != Bound::kNone && rule.max.bound != Bound::kNone;
    std::string message = lead + "must be " + (two_sided ? "in " : "") + BoundsText(rule);
    // Too many seconds is most often milliseconds written where seconds belong.
    if (rule.unit == "s" && !Keeps(rule.max, value, false)) message += "; " + SecondsHint(value);
    return Failure(std::move(message));
  }
  if (rule.whole && value != std::floor(value)) return Failure(lead + "must be a whole number");
  return {};
}

std::string RangeText(const FieldRule& rule) {
  std::string text = BoundsText(rule);
  if (rule.whole) text = text.empty() ? "whole" : "whole, " + text;
  return text.empty() ? "any" : text;
}

}  // namespace upright::model::internal
