// A Riccati problem as whitespace-separated numbers on standard input, the solution on standard
// output, for cross-checks from scripts. Input: the kind ("care", "care-sign", "dare" or
// "dare-hinf"), n, m, then A (n×n), B (n×m), Q (n×n), R (m×m) and S (n×m), each row by row.
// Output: "ok" and X row by row (exit 0), or "failed <reason>: <message>" (exit 1); unreadable
// input exits 2. "dare-hinf" reads the discrete H-infinity problem in its indefinite form — B's
// first column the disturbance's B1, R = diag(−γ², R_u), S = 0 — solves it with
// DiscreteHinfGain, and prints the gain K's m − 1 rows after X.
#include <cmath>
#include <cstdio>
#include <iostream>
#include <string>

#include "upright/design/discrete_hinf.hpp"
#include "upright/design/riccati.hpp"

namespace {

bool ReadMatrix(std::istream& in, Eigen::Index rows, Eigen::Index cols, Eigen::MatrixXd* matrix) {
  matrix->resize(rows, cols);
  for (Eigen::Index i = 0; i < rows; ++i) {
    for (Eigen::Index j = 0; j < cols; ++j) {
      if (!(in >> (*matrix)(i, j))) return false;
    }
  }
  return true;
}

}  // namespace

int main() {
  using RiccatiResult =
      upright::Result<upright::design::RiccatiSolution, upright::design::SolveError>;
  std::string kind;
  Eigen::Index n = 0, m = 0;
  if (!(std::cin >> kind >> n >> m) || n < 1 || m < 1) {
    std::fprintf(stderr, "expected: care|care-sign|dare|dare-hinf n m, then A B Q R S\n");
    return 2;
  }
  Eigen::MatrixXd A, B, Q, R, S;
  if (!ReadMatrix(std::cin, n, n, &A) || !ReadMatrix(std::cin, n, m, &B) ||
      !ReadMatrix(std::cin, n, n, &Q) || !ReadMatrix(std::cin, m, m, &R) ||
      !ReadMatrix(std::cin, n, m, &S)) {
    std::fprintf(stderr, "input ended before A, B, Q, R and S were complete\n");
    return 2;
  }
  RiccatiResult result = upright::Failure(upright::design::SolveError{});
  Eigen::MatrixXd K;
  if (kind == "dare-hinf") {
    if (m < 2 || !(R(0, 0) < 0) || S.norm() != 0) {
      std::fprintf(stderr, "dare-hinf: expected m >= 2, R(0, 0) = -gamma^2 < 0 and S = 0\n");
      return 2;
    }
    Eigen::MatrixXd X;
    const upright::Result<Eigen::MatrixXd, upright::design::SolveError> gain =
        upright::design::DiscreteHinfGain(A, B.leftCols(1), B.rightCols(m - 1), Q,
                                          R.bottomRightCorner(m - 1, m - 1), std::sqrt(-R(0, 0)),
                                          &X);
    if (gain) {
      K = *gain;
      result = upright::design::RiccatiSolution{X, 0};
    } else {
      result = upright::Failure(gain.error());
    }
  } else if (kind == "care") {
    result = upright::design::SolveCare(A, B, Q, R, S);
  } else if (kind == "care-sign") {
    result = upright::design::SolveCareBySign(A, B, Q, R, S);
  } else if (kind == "dare") {
    result = upright::design::SolveDare(A, B, Q, R, S);
  } else {
    std::fprintf(stderr, "unknown kind '%s': expected care, care-sign, dare or dare-hinf\n",
                 kind.c_str());
    return 2;
  }
  if (!result) {
    std::printf("failed %s: %s\n", upright::design::ToString(result.error().reason),
                result.error().message.c_str());
    return 1;
  }
  std::printf("ok\n");
  for (Eigen::Index i = 0; i < n; ++i) {
    for (Eigen::Index j = 0; j < n; ++j) std::printf(j == 0 ? "%.17g" : " %.17g", result->X(i, j));
    std::printf("\n");
  }
  for (Eigen::Index i = 0; i < K.rows(); ++i) {
    for (Eigen::Index j = 0; j < n; ++j) std::printf(j == 0 ? "%.17g" : " %.17g", K(i, j));
    std::printf("\n");
  }
  return 0;
}
