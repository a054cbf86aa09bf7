// The Riccati solvers, and the discrete H-infinity design on the indefinite DARE, against SLICOT's
// SB02OD (generalised Schur method on the extended pencil, which never inverts R) and SB02MD
// (Schur method on the Hamiltonian), called through the Fortran interface on random problems with
// fixed seeds.
#include <gtest/gtest.h>

#include <cmath>
#include <cstddef>
#include <cstdio>
#include <random>
#include <vector>

#include "succeeded.hpp"
#include "upright/design/discrete_hinf.hpp"
#include "upright/design/riccati.hpp"

extern "C" {
// SLICOT SB02OD: CARE/DARE with B, R, Q and cross term L. Fortran calling convention: every
// argument by pointer, INTEGER and LOGICAL as int, one hidden length per CHARACTER argument.
void sb02od_(const char* dico, const char* jobb, const char* fact, const char* uplo,
             const char* jobl, const char* sort, const int* n, const int* m, const int* p,
             double* a, const int* lda, double* b, const int* ldb, double* q, const int* ldq,
             double* r, const int* ldr, double* l, const int* ldl, double* rcond, double* x,
             const int* ldx, double* alfar, double* alfai, double* beta, double* s, const int* lds,
             double* t, const int* ldt, double* u, const int* ldu, const double* tol, int* iwork,
             double* dwork, const int* ldwork, int* bwork, int* info, std::size_t dico_len,
             std::size_t jobb_len, std::size_t fact_len, std::size_t uplo_len, std::size_t jobl_len,
             std::size_t sort_len);

// SLICOT SB02MD: CARE/DARE given G = B R⁻¹ Bᵀ; Q is overwritten by X.
void sb02md_(const char* dico, const char* hinv, const char* uplo, const char* scal,
             const char* sort, const int* n, double* a, const int* lda, double* g, const int* ldg,
             double* q, const int* ldq, double* rcond, double* wr, double* wi, double* s,
             const int* lds, double* u, const int* ldu, int* iwork, double* dwork,
             const int* ldwork, int* bwork, int* info, std::size_t dico_len, std::size_t hinv_len,
             std::size_t uplo_len, std::size_t scal_len, std::size_t sort_len);
}

namespace upright::design {
namespace {

using Eigen::MatrixXd;

// Agreement demanded of our solvers with SLICOT, ‖X − X_ref‖_F / ‖X_ref‖_F.
constexpr double kAgreement = 1e-8;

struct Reference {
  MatrixXd X;
  int info = -1;
};

// SB02OD with JOBB = 'B' (B and R given), FACT = 'N' (Q and R given), SORT = 'S' (stable
// eigenvalues first). All inputs are copied: the routine overwrites them.
Reference Sb02od(char dico, const MatrixXd& A, const MatrixXd& B, const MatrixXd& Q,
                 const MatrixXd& R, const MatrixXd& S) {
  const int n = static_cast<int>(A.rows());
  const int m = static_cast<int>(B.cols());
  const int p = 0;
  const int size = 2 * n + m;
  MatrixXd a = A, b = B, q = Q, r = R;
  MatrixXd l = S.size() == 0 ? MatrixXd::Zero(n, m) : S;
  const char jobl = S.size() == 0 ? 'Z' : 'N';
  const char jobb = 'B', fact = 'N', uplo = 'U', sort = 'S';
  Reference reference;
  reference.X = MatrixXd::Zero(n, n);
  std::vector<double> alfar(2 * n), alfai(2 * n), beta(2 * n);
  MatrixXd s(size, size), t(size, 2 * n), u(2 * n, 2 * n);
  const int ldwork = std::max({7 * (2 * n + 1) + 16, 16 * n, 2 * n + m, 3 * m}) * 4;
  std::vector<double> dwork(ldwork);
  std::vector<int> iwork(std::max({1, m, 2 * n}));
  std::vector<int> bwork(2 * n);
  const double tol = 0;
  double rcond = 0;
  const int lds = size, ldt = size, ldu = 2 * n;
  sb02od_(&dico, &jobb, &fact, &uplo, &jobl, &sort, &n, &m, &p, a.data(), &n, b.data(), &n,
          q.data(), &n, r.data(), &m, l.data(), &n, &rcond, reference.X.data(), &n, alfar.data(),
          alfai.data(), beta.data(), s.data(), &lds, t.data(), &ldt, u.data(), &ldu, &tol,
          iwork.data(), dwork.data(), &ldwork, bwork.data(), &reference.info, 1, 1, 1, 1, 1, 1);
  return reference;
}

// SB02MD for the continuous equation with G given, Schur method, general scaling.
Reference Sb02md(const MatrixXd& A, const MatrixXd& G, const MatrixXd& Q) {
  const int n = static_cast<int>(A.rows());
  MatrixXd a = A, g = G;
  Reference reference;
  reference.X = Q;
  const char dico = 'C', hinv = 'D', uplo = 'U', scal = 'G', sort = 'S';
  std::vector<double> wr(2 * n), wi(2 * n);
  MatrixXd s(2 * n, 2 * n), u(2 * n, 2 * n);
  const int lds = 2 * n, ldu = 2 * n;
  const int ldwork = std::max(3, 6 * n) * 4;
  std::vector<double> dwork(ldwork);
  std::vector<int> iwork(2 * n), bwork(2 * n);
  double rcond = 0;
  sb02md_(&dico, &hinv, &uplo, &scal, &sort, &n, a.data(), &n, g.data(), &n, reference.X.data(), &n,
          &rcond, wr.data(), wi.data(), s.data(), &lds, u.data(), &ldu, iwork.data(), dwork.data(),
          &ldwork, bwork.data(), &reference.info, 1, 1, 1, 1, 1);
  // SB02MD fills the triangle named by UPLO and the solution is symmetric.
  reference.X = reference.X.selfadjointView<Eigen::Upper>();
  return reference;
}

double RelativeDifference(const MatrixXd& value, const MatrixXd& reference) {
  return (value - reference).norm() / reference.norm();
}

MatrixXd RandomMatrix(std::mt19937* rng, Eigen::Index rows, Eigen::Index cols) {
  std::normal_distribution<double> normal;
  MatrixXd matrix(rows, cols);
  for (double& value : matrix.reshaped()) value = normal(*rng);
  return matrix;
}

struct Problem {
  MatrixXd A, B, Q, R, S;
};

// z = C x + D u with Q = CᵀC, R = DᵀD (+ I without a cross term), S = CᵀD when asked for.
Problem RandomProblem(unsigned seed, int n, int m, bool cross_term) {
  std::mt19937 rng(seed);
  Problem p;
  p.A = RandomMatrix(&rng, n, n);
  p.B = RandomMatrix(&rng, n, m);
  const MatrixXd C = RandomMatrix(&rng, n + m, n);
  const MatrixXd D = RandomMatrix(&rng, n + m, m);
  p.Q = C.transpose() * C;
  p.Q = 0.5 * (p.Q + p.Q.transpose()).eval();
  p.R = D.transpose() * D;
  p.R = 0.5 * (p.R + p.R.transpose()).eval();
  if (cross_term) {
    p.S = C.transpose() * D;
  } else {
    p.R += MatrixXd::Identity(m, m);
  }
  return p;
}

// One comparison: our X against SLICOT's, both must succeed.
double Compare(const Result<RiccatiSolution, SolveError>& ours, const Reference& reference,
               const char* what) {
  EXPECT_EQ(reference.info, 0) << what;
  EXPECT_TRUE(Succeeded(ours)) << what;
  if (reference.info != 0 || !ours) return INFINITY;
  const double difference = RelativeDifference(ours->X, reference.X);
  EXPECT_LT(difference, kAgreement) << what;
  return difference;
}

TEST(SlicotRiccati, Sb02odCallReproducesItsDocumentedExample) {
  // X = [√3 1; 1 √3], tol 1e-10 (SLICOT SB02OD, its documentation's program example). Proves the
  // Fortran call itself before it serves as a reference.
  const MatrixXd A{{0, 1}, {0, 0}};
  const MatrixXd B{{0}, {1}};
  const Reference reference =
      Sb02od('C', A, B, MatrixXd::Identity(2, 2), MatrixXd::Identity(1, 1), MatrixXd());
  ASSERT_EQ(reference.info, 0);
  const double root3 = std::sqrt(3.0);
  const MatrixXd expected{{root3, 1}, {1, root3}};
  EXPECT_LT((reference.X - expected).cwiseAbs().maxCoeff(), 1e-10);
}

TEST(SlicotRiccati, Sb02mdCallReproducesItsDocumentedExample) {
  // A = [0 1; 0 0], Q = diag(1, 2), G = diag(0, 1) → X = [2 1; 1 2], tol 1e-10 (SLICOT SB02MD,
  // its documentation's program example).
  const Reference reference =
      Sb02md(MatrixXd{{0, 1}, {0, 0}}, MatrixXd{{0, 0}, {0, 1}}, MatrixXd{{1, 0}, {0, 2}});
  ASSERT_EQ(reference.info, 0);
  const MatrixXd expected{{2, 1}, {1, 2}};
  EXPECT_LT((reference.X - expected).cwiseAbs().maxCoeff(), 1e-10);
}

TEST(SlicotRiccati, ContinuousLqrAgreesWithSb02od) {
  double worst = 0;
  for (int n = 2; n <= 8; ++n) {
    for (int m = 1; m <= 3; ++m) {
      const Problem p = RandomProblem(static_cast<unsigned>(1000 + 10 * n + m), n, m, false);
      const std::string what = "n " + std::to_string(n) + " m " + std::to_string(m);
      const Reference reference = Sb02od('C', p.A, p.B, p.Q, p.R, MatrixXd());
      worst = std::max(worst, Compare(SolveCare(p.A, p.B, p.Q, p.R), reference, what.c_str()));
      worst =
          std::max(worst, Compare(SolveCareBySign(p.A, p.B, p.Q, p.R), reference, what.c_str()));
    }
  }
  std::printf("CARE vs SB02OD: largest relative difference %.3g\n", worst);
}

TEST(SlicotRiccati, ContinuousCrossTermAgreesWithSb02od) {
  double worst = 0;
  for (int n = 2; n <= 8; ++n) {
    for (int m = 1; m <= 3; ++m) {
      const Problem p = RandomProblem(static_cast<unsigned>(2000 + 10 * n + m), n, m, true);
      const std::string what = "n " + std::to_string(n) + " m " + std::to_string(m);
      const Reference reference = Sb02od('C', p.A, p.B, p.Q, p.R, p.S);
      worst = std::max(worst, Compare(SolveCare(p.A, p.B, p.Q, p.R, p.S), reference, what.c_str()));
    }
  }
  std::printf("CARE with S vs SB02OD: largest relative difference %.3g\n", worst);
}

TEST(SlicotRiccati, IndefiniteHinfFormAgreesWithSb02od) {
  // ẋ = A x + B1 w + B2 u, z = C x + D u in the one-solver form: B̃ = [B1 B2],
  // R̃ = diag(−γ² I, DᵀD), S̃ = [0, CᵀD], Q = CᵀC. γ is twice the smallest power of two at which
  // our solver finds X ≥ 0, so it lies comfortably above γ_opt; SB02OD works on the extended
  // pencil and accepts the indefinite R̃ directly.
  double worst = 0;
  for (int n = 2; n <= 8; n += 2) {
    const int m = 1 + n % 3;
    std::mt19937 rng(static_cast<unsigned>(3000 + n));
    const MatrixXd A = RandomMatrix(&rng, n, n);
    const MatrixXd B1 = RandomMatrix(&rng, n, 1);
    const MatrixXd B2 = RandomMatrix(&rng, n, m);
    const MatrixXd C = RandomMatrix(&rng, n + m, n);
    const MatrixXd D = RandomMatrix(&rng, n + m, m);
    MatrixXd B(n, m + 1);
    B << B1, B2;
    const MatrixXd Q = 0.5 * (C.transpose() * C + (C.transpose() * C).transpose());
    MatrixXd S = MatrixXd::Zero(n, m + 1);
    S.rightCols(m) = C.transpose() * D;
    const auto weights = [&](double gamma) {
      MatrixXd R = MatrixXd::Zero(m + 1, m + 1);
      R(0, 0) = -gamma * gamma;
      R.bottomRightCorner(m, m) = D.transpose() * D;
      return MatrixXd(0.5 * (R + R.transpose()));
    };
    double feasible = 64;
    ASSERT_TRUE(SolveCare(A, B, Q, weights(feasible), S).has_value()) << "n " << n;
    while (feasible > 1e-3 && SolveCare(A, B, Q, weights(feasible / 2), S).has_value())
      feasible /= 2;
    const double gamma = 2 * feasible;
    const MatrixXd R = weights(gamma);
    const std::string what = "n " + std::to_string(n) + " γ " + std::to_string(gamma);
    const Reference reference = Sb02od('C', A, B, Q, R, S);
    worst = std::max(worst, Compare(SolveCare(A, B, Q, R, S), reference, what.c_str()));
    worst = std::max(worst, Compare(SolveCareBySign(A, B, Q, R, S), reference, what.c_str()));
  }
  std::printf("H-infinity CARE vs SB02OD: largest relative difference %.3g\n", worst);
}

TEST(SlicotRiccati, DiscreteAgreesWithSb02od) {
  double worst = 0;
  for (int n = 2; n <= 8; ++n) {
    for (int m = 1; m <= 3; ++m) {
      const bool cross_term = (n + m) % 2 == 0;
      Problem p = RandomProblem(static_cast<unsigned>(4000 + 10 * n + m), n, m, cross_term);
      p.A *= 1.2 / std::sqrt(static_cast<double>(n));  // spectral radius around 1.2
      const std::string what =
          "n " + std::to_string(n) + " m " + std::to_string(m) + (cross_term ? " with S" : "");
      const Reference reference = Sb02od('D', p.A, p.B, p.Q, p.R, p.S);
      worst = std::max(worst, Compare(SolveDare(p.A, p.B, p.Q, p.R, p.S), reference, what.c_str()));
    }
  }
  std::printf("DARE vs SB02OD: largest relative difference %.3g\n", worst);
}

TEST(SlicotRiccati, DiscreteHinfAgreesWithSb02od) {
  // x⁺ = A x + B1 w + B2 u, z = [Q½ x; R½ u]: the discrete game as one DARE with B̃ = [B1 B2],
  // R̃ = diag(−γ², R), which SB02OD takes as it is. γ is twice the smallest power of two at which
  // our design succeeds; both X and the gain (the u rows of (R̃ + B̃ᵀX B̃)⁻¹ B̃ᵀX A from SLICOT's X)
  // must agree, and SLICOT's X must meet the game's conditions there too.
  double worst = 0;
  for (int n = 2; n <= 8; n += 2) {
    const int m = 1 + n % 3;
    std::mt19937 rng(static_cast<unsigned>(6000 + n));
    MatrixXd A = RandomMatrix(&rng, n, n);
    A *= 1.2 / A.eigenvalues().cwiseAbs().maxCoeff();
    const MatrixXd B1 = 0.5 * RandomMatrix(&rng, n, 1);
    const MatrixXd B2 = RandomMatrix(&rng, n, m);
    const MatrixXd C = RandomMatrix(&rng, n + m, n);
    const MatrixXd D = RandomMatrix(&rng, n + m, m);
    const MatrixXd Q = 0.5 * (C.transpose() * C + (C.transpose() * C).transpose());
    MatrixXd Ru = D.transpose() * D + MatrixXd::Identity(m, m);
    Ru = 0.5 * (Ru + Ru.transpose()).eval();
    double feasible = 64;
    ASSERT_TRUE(DiscreteHinfGain(A, B1, B2, Q, Ru, feasible).has_value()) << "n " << n;
    while (feasible > 1e-3 && DiscreteHinfGain(A, B1, B2, Q, Ru, feasible / 2).has_value()) {
      feasible /= 2;
    }
    const double gamma = 2 * feasible;
    MatrixXd B(n, m + 1);
    B << B1, B2;
    MatrixXd R = MatrixXd::Zero(m + 1, m + 1);
    R(0, 0) = -gamma * gamma;
    R.bottomRightCorner(m, m) = Ru;
    const std::string what = "n " + std::to_string(n) + " γ " + std::to_string(gamma);
    const Reference reference = Sb02od('D', A, B, Q, R, MatrixXd());
    ASSERT_EQ(reference.info, 0) << what;
    MatrixXd X;
    const Result<MatrixXd, SolveError> K = DiscreteHinfGain(A, B1, B2, Q, Ru, gamma, &X);
    ASSERT_TRUE(Succeeded(K)) << what;
    const MatrixXd& Xr = reference.X;
    const MatrixXd K_reference =
        (R + B.transpose() * Xr * B).fullPivLu().solve(B.transpose() * Xr * A).bottomRows(m);
    EXPECT_GE(Eigen::SelfAdjointEigenSolver<MatrixXd>(Xr).eigenvalues().minCoeff(),
              -1e-8 * Xr.norm())
        << what;
    EXPECT_GT(gamma * gamma - (B1.transpose() * Xr * B1)(0, 0), 0) << what;
    const double difference =
        std::max(RelativeDifference(X, Xr), RelativeDifference(*K, K_reference));
    EXPECT_LT(difference, kAgreement) << what;
    worst = std::max(worst, difference);
  }
  std::printf("discrete H-infinity vs SB02OD: largest relative difference of X and K %.3g\n",
              worst);
}

TEST(SlicotRiccati, ContinuousAgreesWithSb02mdGivenG) {
  // SB02MD takes G = B R⁻¹ Bᵀ: an independent Schur implementation on the Hamiltonian.
  double worst = 0;
  for (int n = 2; n <= 8; n += 3) {
    const Problem p = RandomProblem(static_cast<unsigned>(5000 + n), n, 2, false);
    const MatrixXd G = p.B * p.R.inverse() * p.B.transpose();
    const Reference reference = Sb02md(p.A, 0.5 * (G + G.transpose()), p.Q);
    worst = std::max(worst, Compare(SolveCare(p.A, p.B, p.Q, p.R), reference,
                                    ("n " + std::to_string(n)).c_str()));
  }
  std::printf("CARE vs SB02MD: largest relative difference %.3g\n", worst);
}

}  // namespace
}  // namespace upright::design
