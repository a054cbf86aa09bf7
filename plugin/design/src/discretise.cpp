// Zero-order-hold discretisation by Van Loan's block exponential:
//   exp([A B; 0 0] T) = [Ad Bd; 0 I].
#include <Eigen/Dense>
#include <cmath>
#include <string>
#include <unsupported/Eigen/MatrixFunctions>

#include "riccati_common.hpp"
#include "upright/design/riccati.hpp"

namespace upright::design {

Result<ZohSystem, SolveError> DiscretiseZoh(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B,
                                            double period_s) {
  const Eigen::Index n = A.rows();
  const Eigen::Index m = B.cols();
  const auto invalid = [](const std::string& why) {
    return internal::Fail(SolveFailure::kInvalidInput, "DiscretiseZoh: " + why);
  };
  if (n == 0 || A.cols() != n || B.rows() != n) {
    return invalid("A is " + std::to_string(A.rows()) + "x" + std::to_string(A.cols()) +
                   " and B is " + std::to_string(B.rows()) + "x" + std::to_string(m) +
                   ", expected A square and B with as many rows");
  }
  if (!(std::isfinite(period_s) && period_s >= 0)) {
    return invalid("period_s = " + std::to_string(period_s) + ", must be finite and >= 0");
  }
  if (!A.allFinite() || !B.allFinite()) return invalid("A or B has a non-finite entry");
  Eigen::MatrixXd block = Eigen::MatrixXd::Zero(n + m, n + m);
  block.topLeftCorner(n, n) = A * period_s;
  block.topRightCorner(n, m) = B * period_s;
  const Eigen::MatrixXd exponential = block.exp();
  return ZohSystem{exponential.topLeftCorner(n, n), exponential.topRightCorner(n, m)};
}

}  // namespace upright::design
