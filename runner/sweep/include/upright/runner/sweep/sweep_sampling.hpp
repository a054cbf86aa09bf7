// Sampling for Monte Carlo sweeps: a scenario with dispersions, a sweep seed and a sample index in;
// the scenario with every dispersed parameter set to its draw out. Sample i of seed S is the same
// whatever the number of samples or jobs: each dispersion draws from its own stream.
#pragma once

#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include "upright/runner/scenario/scenario.hpp"

namespace upright::runner {

// A draw the parameter rejects (a negative mass from a wide normal) is drawn again, up to this
// many times; the spread is then truncated by redrawing (its tails past what the parameter takes
// are cut off and the rest rescaled), not clamped to the limit.
inline constexpr int kMaxRedraws = 100;

// The seed of sample `sample`'s stream for dispersion `dispersion` (both 0-based) in a sweep of
// seed `sweep_seed`: h(h(h(sweep_seed) ^ sample) ^ dispersion), h the splitmix64 step
// (x + 0x9e3779b97f4a7c15, then its xor-shift-multiply finaliser). The stream is sim::Random.
std::uint64_t DispersionStreamSeed(std::uint64_t sweep_seed, std::size_t sample,
                                   std::size_t dispersion);

// The sensor-noise seed of sample `sample` (0-based): sample + 1.
std::uint64_t SampleNoiseSeed(std::size_t sample);

struct SampledScenario {
  Scenario scenario;           // meaningful only when error is empty
  std::vector<double> values;  // per dispersion, file units, the accepted draw (NaN: none)
  std::vector<int> redraws;    // per dispersion, how many draws were rejected first
  std::string error;           // "" or why the sample could not be made (every draw rejected)
};

// Sample `sample` of `nominal`: the dispersions applied in file order, each draw set through
// SetScenarioParameter (robot fields change the robot as built, not the controllers' design
// model). A normal draw is mean + sd · N(0, 1), a uniform one lo + (hi − lo) · U[0, 1).
SampledScenario SampleScenario(const Scenario& nominal, std::uint64_t sweep_seed,
                               std::size_t sample);

}  // namespace upright::runner
