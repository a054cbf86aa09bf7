// manifest.json of a sweep: what was run (tool version, input hashes, seed, samples, the
// dispersions and how samples are seeded) and how long it took.
#include "upright/runner/common/json_text.hpp"
#include "upright/runner/sweep/sweep_sampling.hpp"
#include "upright/runner/sweep/sweep_writer.hpp"
#include "upright/runner/tables/scenario_info_json.hpp"

namespace upright::runner {

std::string SweepManifestJson(const SweepResult& result) {
  JsonText json;
  json.BeginObject();
  json.String("tool_version", result.tool_version);
  json.String("command", "sweep");
  json.BeginObject("scenario");
  AppendScenarioInfoFields(&json, result.scenario);
  json.EndObject();
  json.Unsigned("seed", result.seed);
  json.Unsigned("samples", result.samples.size());
  json.String("sample_stream_seed",
              "splitmix64(splitmix64(splitmix64(seed) ^ sample) ^ dispersion), 0-based");
  json.String("noise_seed", "sample + 1");
  json.Integer("max_redraws", kMaxRedraws);
  json.BeginArray("dispersions");
  for (const Dispersion& d : result.dispersions) {
    json.BeginObject();
    json.String("param", d.param);
    json.String("kind", ToString(d.kind));
    json.Number("nominal", d.nominal);
    if (d.kind == SpreadKind::kNormal) {
      json.Number("mean", d.mean);
      json.Number("sd", d.sd);
    } else {
      json.Number("lo", d.lo);
      json.Number("hi", d.hi);
    }
    json.EndObject();
  }
  json.EndArray();
  std::uint64_t failed_samples = 0;
  for (const SweepSample& sample : result.samples) failed_samples += sample.error.empty() ? 0 : 1;
  json.Unsigned("failed_samples", failed_samples);
  json.Unsigned("runs", result.runs.size());
  json.Integer("jobs", result.jobs);
  json.Number("wall_s", result.wall_s);
  json.EndObject();
  return json.text();
}

}  // namespace upright::runner
