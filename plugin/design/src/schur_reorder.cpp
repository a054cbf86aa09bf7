// Adjacent swaps of diagonal entries of a complex Schur form.
#include "schur_reorder.hpp"

#include <cmath>

namespace upright::design::internal {
namespace {

// Exchanges T(k, k) and T(k + 1, k + 1). With t11, t22 the two entries and t12 the one between
// them, v = [t12, t22 − t11] is the eigenvector of the 2×2 block for t22; the unitary Z whose
// first column is v/‖v‖ brings t22 to the top: Zᴴ [t11 t12; 0 t22] Z = [t22 x; 0 t11].
void SwapAdjacent(Eigen::MatrixXcd* T, Eigen::MatrixXcd* U, Eigen::Index k) {
  using Complex = std::complex<double>;
  const Complex t11 = (*T)(k, k);
  const Complex t22 = (*T)(k + 1, k + 1);
  const Complex a = (*T)(k, k + 1);
  const Complex b = t22 - t11;
  const double length = std::hypot(std::abs(a), std::abs(b));
  if (length == 0) return;  // equal entries with nothing between them: already in either order
  Eigen::Matrix2cd Z;
  Z << a / length, -std::conj(b) / length, b / length, std::conj(a) / length;
  const Eigen::Index n = T->rows();
  T->middleRows(k, 2).rightCols(n - k) = Z.adjoint() * T->middleRows(k, 2).rightCols(n - k);
  T->middleCols(k, 2).topRows(k + 2) = T->middleCols(k, 2).topRows(k + 2) * Z;
  U->middleCols(k, 2) = U->middleCols(k, 2) * Z;
  (*T)(k, k) = t22;
  (*T)(k + 1, k + 1) = t11;
  (*T)(k + 1, k) = 0;
}

}  // namespace

Eigen::Index ReorderSchur(Eigen::MatrixXcd* T, Eigen::MatrixXcd* U,
                          const std::function<bool(std::complex<double>)>& select) {
  Eigen::Index placed = 0;
  for (Eigen::Index j = 0; j < T->rows(); ++j) {
    if (!select((*T)(j, j))) continue;
    for (Eigen::Index k = j; k > placed; --k) SwapAdjacent(T, U, k - 1);
    ++placed;
  }
  return placed;
}

}  // namespace upright::design::internal
