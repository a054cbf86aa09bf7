#include "upright/design/design_set.hpp"

#include <cmath>
#include <sstream>

#include "upright/model/conventions.hpp"

namespace upright::design {
namespace {

// The loop's analysis into the report: its figures, even when it stopped short, and whether it
// did and why.
void Finish(ControllerReport* report, const LinearModel& plant, const Measurement& meas,
            const LinearController& ctrl, const Performance& perf) {
  const AnalysisResult<LoopAnalysis> analysis = AnalyseLoop(plant, meas, ctrl, perf);
  report->measurement = meas;
  report->controller = ctrl;
  report->loop = analysis ? *analysis : analysis.error().found;
  report->ok = analysis.has_value();
  report->message = analysis ? "ok" : analysis.error().message;
}

// The delay the report's figures leave out (see ControllerReport::unanalysed_delay_s). A
// zero-order hold lags like a delay of half its period (common practice).
void NoteUnanalysedDelay(ControllerReport* report, double latency_s, double period_s) {
  report->unanalysed_delay_s = report->sampled.analysed() ? 0 : latency_s + period_s / 2;
}

// The loop as the module samples it, with the sensors' latency, into the report: its poles and
// margins. A plant that cannot be sampled fails the design; margins that stop short keep what
// they found.
template <class Report>
void NoteSampledWithLatency(Report* report, const LinearModel& plant, const SampledLaw& law,
                            double period_s, double latency_s) {
  const Result<DelayedLoop, SolveError> loop =
      SampledDelayedLoop(plant, law, period_s, std::vector<double>(kInputs, latency_s));
  if (!loop) {
    report->ok = false;
    report->message = loop.error().message;
    return;
  }
  report->sampled = loop->poles;
  report->sampled_loop = loop->open;
  if (!(loop->poles.max_abs_z < 1)) return;  // no margins for an unstable loop
  const AnalysisResult<SampledMargins> margins =
      AnalyseSampledMargins(plant, law, period_s, latency_s);
  report->sampled_margins = margins ? *margins : margins.error().found;
}

// The discrete LQR on the delay-augmented model and its sampled loop with the latency.
void DesignDelayAwareLqr(DelayAwareLqrReport* report, const LinearModel& plant,
                         const Performance& perf, double period_s, double latency_s) {
  const Result<Eigen::MatrixXd, SolveError> gain =
      RobotDelayedLqr(plant, perf.Q, perf.R, period_s, latency_s);
  if (!gain) {
    report->message = gain.error().message;
    return;
  }
  report->K = *gain;
  report->memory = static_cast<int>((gain->cols() - kStates) / kInputs);
  report->ok = true;
  report->message = "ok";
  NoteSampledWithLatency(report, plant, SampledLaw{*gain, report->memory}, period_s, latency_s);
}

// The γ / γ_opt the H-infinity designs sit at: the factor asked for, or the rule's (ChooseGamma
// on the discrete design at period_s, the hinf module's); 0 when a γ is asked for instead. The
// report notes which, and the rule's choice.
Result<double> PickFactor(const DesignRequest& req, const LinearModel& plant,
                          const Performance& perf, const model::RobotModel& model, double period_s,
                          HinfReport* report) {
  if (req.gamma > 0) {
    report->source = GammaSource::kGiven;
    return 0.0;
  }
  if (req.gamma_factor > 0) {
    report->source = GammaSource::kFactor;
    return req.gamma_factor;
  }
  report->source = GammaSource::kRule;
  const Result<GammaChoice> choice =
      ChooseGamma(plant, perf, report->gamma_opt_discrete, model, period_s);
  if (!choice) return Failure(choice.error());
  report->choice = *choice;
  return choice->factor;
}

}  // namespace

const char* ToString(DesignStatus status) {
  switch (status) {
    case DesignStatus::kOk:
      return "ok";
    case DesignStatus::kUnstableSampled:
      return "unstable_sampled";
    case DesignStatus::kFailed:
      return "failed";
    case DesignStatus::kUnsupported:
      return "unsupported";
  }
  return "failed";
}

DesignStatus ControllerReport::status() const {
  if (!supported) return DesignStatus::kUnsupported;
  if (!ok) return DesignStatus::kFailed;
  if (sampled.analysed() && !(sampled.max_abs_z < 1)) return DesignStatus::kUnstableSampled;
  return DesignStatus::kOk;
}

Status DesignRequest::Validate() const {
  std::ostringstream why;
  if (!(rate_hz >= 0) || !std::isfinite(rate_hz)) {
    why << "DesignRequest::rate_hz = " << rate_hz << ", must be > 0 (or 0 for the model's)";
  } else if (!(gamma >= 0) || !std::isfinite(gamma)) {
    why << "DesignRequest::gamma = " << gamma << ", must be > 0 (or 0 for gamma_factor x "
        << "gamma_opt)";
  } else if (!(gamma_factor == 0 || gamma_factor > 1) || !std::isfinite(gamma_factor)) {
    why << "DesignRequest::gamma_factor = " << gamma_factor
        << ", must be > 1 (or 0 for the rule of the design push)";
  } else if (!(push_scale_N >= 0) || !std::isfinite(push_scale_N)) {
    why << "DesignRequest::push_scale_N = " << push_scale_N << ", must be >= 0";
  } else if (!std::isfinite(push_height_m)) {
    why << "DesignRequest::push_height_m = " << push_height_m << ", must be finite";
  } else if (Status valid_weights = weights.Validate(); !valid_weights) {
    why << valid_weights.error();
  } else if (Status valid_poles = pid_poles.Validate(); !valid_poles) {
    why << valid_poles.error();
  }
  if (why.tellp() == 0) return {};
  return Failure(why.str());
}

DesignSet DesignAll(const model::RobotModel& model, const DesignRequest& request) {
  DesignSet set;
  set.request = request;
  DesignRequest& req = set.request;
  if (req.rate_hz == 0) req.rate_hz = model.control_rate_hz;
  set.plant = Linearise(model, req.input, req.push_height_m);
  const LinearModel& plant = set.plant;
  if (req.push_scale_N == 0) {
    req.push_scale_N = 0.1 * model.total_mass_kg() * model::kStandardGravity_m_s2;
  }
  set.limits = RobotLimits{GroundContact(model, plant.equilibrium_pitch_rad),
                           InputLimit(model, req.input), model.motor.current_limit_A};
  set.design_push = DesignPushFor(plant, req.push_scale_N);
  if (Result<DesignWeights> resolved =
          WeightsForRobot(req.weights, model, plant.equilibrium_pitch_rad);
      resolved) {
    req.weights = *resolved;
  } else {
    for (ControllerReport* report :
         {&set.lqr, static_cast<ControllerReport*>(&set.hinf),
          static_cast<ControllerReport*>(&set.lqg), static_cast<ControllerReport*>(&set.pid)}) {
      report->message = resolved.error();
    }
    return set;
  }
  const double period_s = 1 / req.rate_hz;
  const double latency_s = model.sensors.latency_s;
  Performance& perf = set.performance;
  perf.Q = StateWeight(req.weights);
  perf.R = InputWeight(req.weights, model, req.input);
  perf.push_scale_N = req.push_scale_N;

  // LQR.
  const Result<Eigen::MatrixXd, SolveError> lqr = RobotLqr(plant, perf.Q, perf.R);
  const Result<Eigen::MatrixXd, SolveError> lqr_d =
      RobotDiscreteLqr(plant, perf.Q, perf.R, period_s);
  if (lqr && lqr_d) {
    set.lqr.K = *lqr;
    set.lqr.K_discrete = *lqr_d;
    Finish(&set.lqr, plant, FullState(), StateFeedback(*lqr), perf);
    NoteSampledWithLatency(&set.lqr, plant, SampledLaw{*lqr_d}, period_s, latency_s);
  } else {
    set.lqr.message = lqr ? lqr_d.error().message : lqr.error().message;
  }

  // H-infinity state feedback: the continuous design, and the discrete one at the sample rate that
  // the hinf module runs, each with its own γ_opt, both at the same γ / γ_opt (the rule's on the
  // discrete design, or the factor asked for), or both at the γ asked for.
  const Result<GammaSearch, SolveError> search =
      RobotOptimalGamma(plant, perf.Q, perf.R, perf.push_scale_N);
  const Result<GammaSearch, SolveError> search_discrete =
      RobotDiscreteOptimalGamma(plant, perf.Q, perf.R, perf.push_scale_N, period_s);
  if (!search) {
    set.hinf.message = search.error().message;
  } else if (!search_discrete) {
    set.hinf.message = search_discrete.error().message;
  } else {
    set.hinf.gamma_opt = search->gamma_opt;
    set.hinf.gamma_opt_discrete = search_discrete->gamma_opt;
    set.hinf.trade_off = GammaTradeOff(plant, perf, search_discrete->gamma_opt, model, period_s);
    const Result<double> factor = PickFactor(req, plant, perf, model, period_s, &set.hinf);
    if (!factor) set.hinf.message = "H-infinity: " + factor.error();
    if (factor && req.gamma == 0) req.gamma = *factor * search->gamma_opt;
    if (factor) set.hinf.gamma = req.gamma;
    if (factor) {
      set.hinf.gamma_discrete =
          request.gamma == 0 ? *factor * search_discrete->gamma_opt : request.gamma;
    }
  }
  if (search && search_discrete && set.hinf.gamma > 0) {
    const Result<Eigen::MatrixXd, SolveError> hinf =
        RobotHinf(plant, perf.Q, perf.R, perf.push_scale_N, req.gamma);
    const Result<Eigen::MatrixXd, SolveError> hinf_d = RobotDiscreteHinf(
        plant, perf.Q, perf.R, perf.push_scale_N, set.hinf.gamma_discrete, period_s);
    if (!hinf) {
      std::ostringstream why;
      why << hinf.error().message << " (gamma_opt = " << search->gamma_opt << ")";
      set.hinf.message = why.str();
    } else if (!hinf_d) {
      std::ostringstream why;
      why << hinf_d.error().message << " (discrete gamma_opt = " << search_discrete->gamma_opt
          << ")";
      set.hinf.message = why.str();
    } else {
      set.hinf.K = *hinf;
      set.hinf.K_discrete = *hinf_d;
      Finish(&set.hinf, plant, FullState(), StateFeedback(*hinf), perf);
      // The hinf module runs the discrete gain, with the sensors' latency.
      NoteSampledWithLatency(&set.hinf, plant, SampledLaw{*hinf_d}, period_s, latency_s);
      const AnalysisResult<NormPeak> sampled_norm = SampledPushNorm(plant, *hinf_d, perf, period_s);
      set.hinf.norm_discrete = sampled_norm ? sampled_norm->norm : sampled_norm.error().found.norm;
      if (set.hinf.ok && !(set.hinf.loop.push_norm < req.gamma)) {
        set.hinf.ok = false;
        std::ostringstream why;
        why << "H-infinity: closed-loop norm " << set.hinf.loop.push_norm
            << " is not below gamma = " << req.gamma;
        set.hinf.message = why.str();
      } else if (set.hinf.ok && !(set.hinf.norm_discrete < set.hinf.gamma_discrete)) {
        set.hinf.ok = false;
        std::ostringstream why;
        why << "discrete H-infinity: the sampled loop's norm " << set.hinf.norm_discrete
            << " is not below gamma = " << set.hinf.gamma_discrete;
        if (!sampled_norm) why << " (" << sampled_norm.error().message << ")";
        set.hinf.message = why.str();
      }
    }
  }

  // LQG: the LQR regulator on the Kalman filter the lqg module runs.
  const LinearModel torque_plant = req.input == InputKind::kTorque
                                       ? plant
                                       : Linearise(model, InputKind::kTorque, req.push_height_m);
  const FilterNoise noise = DefaultFilterNoise(model, plant);
  const Result<LqgFilter, SolveError> designed =
      DesignLqgFilter(model, plant, torque_plant, noise, period_s);
  set.lqg.sensors = FilterSensors(model, plant, noise);
  if (!lqr || !lqr_d) {
    set.lqg.message = "LQG needs the LQR regulator: " + set.lqr.message;
  } else if (!designed) {
    set.lqg.message = designed.error().message;
  } else {
    const LqgFilter& filter = *designed;
    set.lqg.K = *lqr;
    set.lqg.K_discrete = *lqr_d;
    set.lqg.L = filter.L;
    set.lqg.L_discrete = filter.L_discrete;
    set.lqg.Ad = filter.Ad;
    set.lqg.Bd = filter.Bd;
    NoteSampledWithLatency(&set.lqg, plant, SampledLaw{*lqr_d, 0, &filter}, period_s, latency_s);
    set.lqg.estimator_fastest_1_s =
        (plant.A - filter.L * filter.sensors.C).eigenvalues().cwiseAbs().maxCoeff();
    // x̂̇ = A x̂ + B u + L (y − C x̂ − D u), u = −K x̂.
    const SensorLinearisation& s = set.lqg.sensors;
    const Eigen::MatrixXd& K = *lqr;
    LinearController ctrl;
    ctrl.Ac = plant.A - plant.B * K - filter.L * s.C + filter.L * s.D * K;
    ctrl.Bc = filter.L;
    ctrl.Cc = -K;
    ctrl.Dc = Eigen::MatrixXd::Zero(kInputs, s.C.rows());
    Finish(&set.lqg, plant, Measurement{s.C, s.D}, ctrl, perf);
  }

  // PID cascade (torque based: its gains are wheel torques per unit error).
  if (req.input != InputKind::kTorque) {
    set.pid.supported = false;
    set.pid.message = "the PID cascade is tuned for torque input only";
  } else {
    set.pid.gains = TunePid(plant, req.pid_poles, req.weights.max_tilt_deg);
    Measurement meas;
    LinearController ctrl;
    PidAsLinearController(set.pid.gains, &meas, &ctrl);
    Finish(&set.pid, plant, meas, ctrl, perf);
  }
  DesignDelayAwareLqr(&set.lqr_delay_aware, plant, perf, period_s, latency_s);
  for (ControllerReport* report :
       {&set.lqr, static_cast<ControllerReport*>(&set.hinf),
        static_cast<ControllerReport*>(&set.lqg), static_cast<ControllerReport*>(&set.pid)}) {
    NoteUnanalysedDelay(report, latency_s, period_s);
  }
  return set;
}

}  // namespace upright::design
