// manifest.json of a sweep: what was run (tool version, input hashes, seed, samples, the
// dispersions and how samples are seeded) and how long it took.
#include "json_text.hpp"
#include "upright/runner/sweep_sampling.hpp"
#include "upright/runner/sweep_writer.hpp"

namespace upright::runner {

std::string SweepManifestJson(const SweepResult& result) {
  internal::JsonText json;
  json.BeginObject();
  json.String("tool_version", result.tool_version);
  json.String("command", "sweep");
  const ScenarioInfo& info = result.scenario;
  json.BeginObject("scenario");
  json.String("name", info.name);
  json.String("path", info.path);
  json.String("sha256", info.sha256);
  json.String("model_name", info.model_name);
  json.String("model_path", info.model_path);
  json.String("model_sha256", info.model_sha256);
  json.Number("dt_s", info.dt_s);
  json.Number("duration_s", info.duration_s);
  json.BeginArray("controllers");
  for (const std::string& controller : info.controllers) json.String({}, controller);
  json.EndArray();
  json.String("baseline", info.baseline);
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
