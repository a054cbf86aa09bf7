// Sample i of a sweep: one sim::Random stream per dispersion, seeded from (sweep seed, i, k);
// draws the parameter rejects are drawn again.
#include "upright/runner/sweep/sweep_sampling.hpp"

#include <limits>
#include <sstream>
#include <utility>

#include "upright/runner/scenario/scenario_parameter.hpp"
#include "upright/sim/random.hpp"

namespace upright::runner {
namespace {

// The splitmix64 output that follows state x (the generator's own seeding step).
std::uint64_t SplitMix64(std::uint64_t x) { return sim::SplitMix64(&x); }

double Draw(const Dispersion& d, sim::Random& random) {
  if (d.kind == SpreadKind::kNormal) return d.mean + d.sd * random.Gaussian();
  return d.lo + (d.hi - d.lo) * random.Uniform();
}

}  // namespace

std::uint64_t DispersionStreamSeed(std::uint64_t sweep_seed, std::size_t sample,
                                   std::size_t dispersion) {
  return SplitMix64(SplitMix64(SplitMix64(sweep_seed) ^ static_cast<std::uint64_t>(sample)) ^
                    static_cast<std::uint64_t>(dispersion));
}

std::uint64_t SampleNoiseSeed(std::size_t sample) { return static_cast<std::uint64_t>(sample) + 1; }

SampledScenario SampleScenario(const Scenario& nominal, std::uint64_t sweep_seed,
                               std::size_t sample) {
  SampledScenario out;
  out.scenario = nominal;
  const std::size_t count = nominal.dispersions.size();
  out.values.assign(count, std::numeric_limits<double>::quiet_NaN());
  out.redraws.assign(count, 0);
  for (std::size_t k = 0; k < count; ++k) {
    const Dispersion& d = nominal.dispersions[k];
    sim::Random random(DispersionStreamSeed(sweep_seed, sample, k));
    Status set;
    for (int attempt = 0; attempt <= kMaxRedraws; ++attempt) {
      const double value = Draw(d, random);
      set = SetScenarioParameter(&out.scenario, d.param, value);
      if (set) {
        out.values[k] = value;
        out.redraws[k] = attempt;
        break;
      }
    }
    if (!set) {
      std::ostringstream why;
      why << d.param << ": " << kMaxRedraws + 1 << " draws in a row rejected (last: " << set.error()
          << ")";
      out.error = why.str();
      out.redraws[k] = kMaxRedraws + 1;
      return out;
    }
  }
  return out;
}

}  // namespace upright::runner
