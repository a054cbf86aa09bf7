// Reordering of a complex Schur form: a triangular T and unitary U in, the same factorisation out
// with the selected eigenvalues leading the diagonal (so U's first columns span their subspace).
#pragma once

#include <Eigen/Dense>
#include <complex>
#include <functional>

namespace upright::design::internal {

// Given M = U T U* with T upper triangular, moves the diagonal entries for which `select` is true
// to the top, keeping their relative order, by unitary swaps of adjacent entries (the idea of
// LAPACK's ztrexc). T and U are updated so that M = U T U* still holds. Returns the number of
// selected eigenvalues.
Eigen::Index ReorderSchur(Eigen::MatrixXcd* T, Eigen::MatrixXcd* U,
                          const std::function<bool(std::complex<double>)>& select);

}  // namespace upright::design::internal
