#include "upright/runner/tune/search.hpp"

#include <algorithm>
#include <cmath>
#include <nlopt.hpp>
#include <numeric>
#include <sstream>
#include <stdexcept>

#include "search_stages.hpp"
#include "upright/model/check.hpp"
#include "upright/sim/random.hpp"

namespace upright::runner {
namespace {

double Misses(const PointScore& score) {
  double sum = 0;
  for (const double c : score.constraints) sum += std::max(0.0, c);
  return sum;
}

// The polish's state, shared with NLopt's callbacks: the history it adds to, what is left of the
// budget and the last point scored (COBYLA asks for the objective and then the constraints of
// the same point).
struct Polish {
  const BatchObjective& objective;
  SearchResult* result;
  int left = 0;
  std::vector<double> last_point;
  PointScore last_score;
  bool stopped = false;

  const PointScore& Score(const double* x, std::size_t n) {
    std::vector<double> point(x, x + n);
    for (double& u : point) u = std::clamp(u, 0.0, 1.0);
    if (!result->history.empty() && point == last_point) return last_score;
    if (left <= 0) {
      stopped = true;
      throw nlopt::forced_stop();
    }
    --left;
    const std::vector<PointScore> scores = objective({point});
    last_point = point;
    last_score = scores.at(0);
    result->history.push_back({point, last_score, SearchStage::kLocal});
    if (Better(last_score, result->history[result->best].score)) {
      result->best = result->history.size() - 1;
    }
    return last_score;
  }
};

double PolishObjective(unsigned n, const double* x, double* /*grad*/, void* data) {
  return static_cast<Polish*>(data)->Score(x, n).objective;
}

void PolishConstraints(unsigned m, double* out, unsigned n, const double* x, double* /*grad*/,
                       void* data) {
  const PointScore& score = static_cast<Polish*>(data)->Score(x, n);
  for (unsigned i = 0; i < m; ++i) out[i] = score.constraints.at(i);
}

}  // namespace

namespace internal {

std::vector<std::vector<double>> LatinHypercube(std::size_t n, std::size_t d, std::uint64_t seed) {
  sim::Random random(seed);
  std::vector<std::vector<double>> points(n, std::vector<double>(d, 0.5));
  if (n == 1) return points;
  std::vector<std::size_t> strata(n);
  for (std::size_t axis = 0; axis < d; ++axis) {
    std::iota(strata.begin(), strata.end(), 0);
    // Fisher–Yates with our own generator (std::shuffle's order is not fixed by the standard).
    for (std::size_t i = n - 1; i > 0; --i) {
      const auto j = static_cast<std::size_t>(random.NextU64() % (i + 1));
      std::swap(strata[i], strata[j]);
    }
    for (std::size_t i = 0; i < n; ++i) {
      points[i][axis] =
          (static_cast<double>(strata[i]) + random.Uniform()) / static_cast<double>(n);
    }
  }
  return points;
}

int GlobalPoints(const SearchOptions& options) {
  return options.global_points > 0
             ? options.global_points
             : std::clamp(static_cast<int>(std::lround(0.4 * options.evaluations)), 1,
                          options.evaluations - 1);
}

int PolishFrom(const SearchOptions& options, PolishAlgorithm algorithm, std::size_t from,
               int budget, const BatchObjective& objective, SearchResult* result) {
  if (budget <= 0) return 0;
  const std::size_t n = options.dimensions;
  const bool constrained = options.constraints > 0;
  // NLopt's BOBYQA needs two or more variables; COBYLA takes one, and any constraints.
  const bool cobyla = algorithm == PolishAlgorithm::kCobyla || constrained || n < 2;
  nlopt::opt opt(cobyla ? nlopt::LN_COBYLA : nlopt::LN_BOBYQA, static_cast<unsigned>(n));
  Polish polish{objective, result, budget, {}, {}, false};
  opt.set_lower_bounds(std::vector<double>(n, 0.0));
  opt.set_upper_bounds(std::vector<double>(n, 1.0));
  opt.set_min_objective(PolishObjective, &polish);
  if (constrained) {
    opt.add_inequality_mconstraint(PolishConstraints, &polish,
                                   std::vector<double>(options.constraints, 0.0));
  }
  opt.set_maxeval(polish.left + 1);  // the budget is kept by Polish; this is a backstop
  opt.set_xtol_abs(options.local_tolerance);
  // The first step, kept inside the box from the start point.
  std::vector<double> x = result->history.at(from).point;
  std::vector<double> step(n);
  for (std::size_t i = 0; i < n; ++i) {
    step[i] = std::min(options.local_step, std::max(x[i], 1 - x[i]));
  }
  opt.set_initial_step(step);
  // The polish's first call repeats its start point, which Polish answers from the start's
  // score without spending an evaluation.
  polish.last_point = x;
  polish.last_score = result->history[from].score;
  double value = 0;
  try {
    opt.optimize(x, value);
  } catch (const nlopt::forced_stop&) {
    // The budget ran out: the history holds every point scored.
  } catch (const std::exception&) {
    // NLopt's round-off and invalid-argument stops: the history still holds every point scored.
  }
  return budget - polish.left;
}

}  // namespace internal

Status SearchOptions::Validate() const {
  std::ostringstream why;
  if (dimensions < 1) {
    why << "SearchOptions::dimensions = " << dimensions << ", must be >= 1";
  } else if (evaluations < 2) {
    why << "SearchOptions::evaluations = " << evaluations << ", must be >= 2";
  } else if (global_points < 0 || global_points >= evaluations) {
    why << "SearchOptions::global_points = " << global_points << ", must be in [0, evaluations)";
  } else if (!(local_step > 0 && local_step <= 1)) {
    why << "SearchOptions::local_step = " << local_step << ", must be in (0, 1]";
  } else if (!(local_tolerance > 0 && local_tolerance < 1)) {
    why << "SearchOptions::local_tolerance = " << local_tolerance << ", must be in (0, 1)";
  } else {
    return {};
  }
  return Failure(why.str());
}

bool Better(const PointScore& a, const PointScore& b) {
  const double miss_a = Misses(a), miss_b = Misses(b);
  if ((miss_a == 0) != (miss_b == 0)) return miss_a == 0;
  if (miss_a > 0) return miss_a < miss_b;
  return a.objective < b.objective;
}

SearchResult Search(const SearchOptions& options, const BatchObjective& objective) {
  const Status valid = options.Validate();
  UPRIGHT_CHECK(valid, "%s", valid ? "" : valid.error().c_str());
  const std::size_t n = options.dimensions;
  const int global = internal::GlobalPoints(options);
  SearchResult result;
  const std::vector<std::vector<double>> start =
      internal::LatinHypercube(static_cast<std::size_t>(global), n, options.seed);
  const std::vector<PointScore> scores = objective(start);
  UPRIGHT_CHECK(scores.size() == start.size(), "a batch objective returned %zu scores for %zu",
                scores.size(), start.size());
  for (std::size_t i = 0; i < start.size(); ++i) {
    result.history.push_back({start[i], scores[i], SearchStage::kGlobal});
    if (Better(scores[i], result.history[result.best].score)) result.best = i;
  }

  internal::PolishFrom(options, internal::PolishAlgorithm::kAuto, result.best,
                       options.evaluations - global, objective, &result);
  return result;
}

}  // namespace upright::runner
