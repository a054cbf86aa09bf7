// Zero-order-hold discretisation by Van Loan's block exponential:
//   exp([A B; 0 0] T) = [Ad Bd; 0 I].
#include <Eigen/Dense>
#include <cmath>
#include <stdexcept>
#include <string>
#include <unsupported/Eigen/MatrixFunctions>

#include "upright/design/riccati.hpp"

namespace upright::design {

void DiscretiseZoh(const Eigen::MatrixXd& A, const Eigen::MatrixXd& B, double period_s,
                   Eigen::MatrixXd* Ad, Eigen::MatrixXd* Bd) {
  const Eigen::Index n = A.rows();
  const Eigen::Index m = B.cols();
  if (Ad == nullptr || Bd == nullptr) {
    throw std::invalid_argument("DiscretiseZoh: Ad and Bd must not be null");
  }
  if (n == 0 || A.cols() != n || B.rows() != n) {
    throw std::invalid_argument("DiscretiseZoh: A is " + std::to_string(A.rows()) + "x" +
                                std::to_string(A.cols()) + " and B is " + std::to_string(B.rows()) +
                                "x" + std::to_string(m) +
                                ", expected A square and B with as many rows");
  }
  if (!(std::isfinite(period_s) && period_s >= 0)) {
    throw std::invalid_argument("DiscretiseZoh: period_s = " + std::to_string(period_s) +
                                ", must be finite and >= 0");
  }
  if (!A.allFinite() || !B.allFinite()) {
    throw std::invalid_argument("DiscretiseZoh: A or B has a non-finite entry");
  }
  Eigen::MatrixXd block = Eigen::MatrixXd::Zero(n + m, n + m);
  block.topLeftCorner(n, n) = A * period_s;
  block.topRightCorner(n, m) = B * period_s;
  const Eigen::MatrixXd exponential = block.exp();
  *Ad = exponential.topLeftCorner(n, n);
  *Bd = exponential.topRightCorner(n, m);
}

}  // namespace upright::design
