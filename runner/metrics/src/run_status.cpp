#include "upright/runner/metrics/run_metrics.hpp"

namespace upright::runner {

const char* ToString(RunStatus status) {
  switch (status) {
    case RunStatus::kNotRun:
      return "not_run";
    case RunStatus::kOk:
      return "ok";
    case RunStatus::kFell:
      return "fell";
    case RunStatus::kControllerFault:
      return "controller_fault";
    case RunStatus::kNumericFailure:
      return "numeric_failure";
    case RunStatus::kSetupFailed:
      return "setup_failed";
  }
  return "?";
}

bool FromString(const std::string& text, RunStatus* status) {
  for (RunStatus s :
       {RunStatus::kNotRun, RunStatus::kOk, RunStatus::kFell, RunStatus::kControllerFault,
        RunStatus::kNumericFailure, RunStatus::kSetupFailed}) {
    if (text == ToString(s)) {
      *status = s;
      return true;
    }
  }
  return false;
}

}  // namespace upright::runner
