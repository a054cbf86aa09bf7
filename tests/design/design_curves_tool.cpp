// The design pictures' curves of one demo robot, for the SciPy cross-check: for each built-in
// controller that designs, each picture's loop (one wheel, common mode; continuous and as the
// module samples it with the latency) as A, B, C, D with its period, frequencies and our
// L(jω); and its linear loop under the design push as A, B, C with the push and our response.
// One JSON object on standard output. Usage: upright_design_curves_tool MODEL.xml
#include <cstdio>
#include <string>
#include <vector>

#include "upright/design/closed_loop.hpp"
#include "upright/design/design_set.hpp"
#include "upright/design/loop_response.hpp"
#include "upright/design/push_response.hpp"
#include "upright/model/model_file.hpp"

namespace {

using upright::design::StateSpace;

void PrintMatrix(const char* key, const Eigen::MatrixXd& m) {
  std::printf("\"%s\": [", key);
  for (Eigen::Index i = 0; i < m.rows(); ++i) {
    std::printf("%s[", i > 0 ? ", " : "");
    for (Eigen::Index j = 0; j < m.cols(); ++j) std::printf("%s%.17g", j > 0 ? ", " : "", m(i, j));
    std::printf("]");
  }
  std::printf("]");
}

void PrintList(const char* key, const std::vector<double>& v) {
  std::printf("\"%s\": [", key);
  for (std::size_t i = 0; i < v.size(); ++i) std::printf("%s%.17g", i > 0 ? ", " : "", v[i]);
  std::printf("]");
}

void PrintLoop(const char* name, const StateSpace& loop, double period_s, bool* first) {
  std::vector<double> omegas = upright::design::LogFrequencies(0.05, 2000, 10);
  if (period_s > 0) std::erase_if(omegas, [&](double w) { return w * period_s >= 3.14; });
  const auto values = upright::design::FrequencyResponse(loop, period_s, omegas);
  std::vector<double> re, im;
  for (const auto& v : values) {
    re.push_back(v.real());
    im.push_back(v.imag());
  }
  std::printf("%s{\"name\": \"%s\", \"period_s\": %.17g, ", *first ? "" : ", ", name, period_s);
  PrintMatrix("A", loop.A);
  std::printf(", ");
  PrintMatrix("B", loop.B);
  std::printf(", ");
  PrintMatrix("C", loop.C);
  std::printf(", ");
  PrintMatrix("D", loop.D);
  std::printf(", ");
  PrintList("omega", omegas);
  std::printf(", ");
  PrintList("re", re);
  std::printf(", ");
  PrintList("im", im);
  std::printf("}\n");
  *first = false;
}

}  // namespace

int main(int argc, char** argv) {
  if (argc != 2) {
    std::fprintf(stderr, "usage: upright_design_curves_tool MODEL.xml\n");
    return 2;
  }
  const auto model = upright::model::LoadModelFile(argv[1]);
  if (!model) {
    std::fprintf(stderr, "%s: cannot load\n", argv[1]);
    return 2;
  }
  const upright::design::DesignSet set = upright::design::DesignAll(*model, {});
  const upright::design::CurrentMap current =
      upright::design::MotorCurrent(*model, set.plant.input);
  const std::pair<const char*, const upright::design::ControllerReport*> controllers[] = {
      {"lqr", &set.lqr}, {"hinf", &set.hinf}, {"lqg", &set.lqg}, {"pid", &set.pid}};
  std::printf("{\"loops\": [\n");
  bool first = true;
  for (const auto& [name, report] : controllers) {
    if (!report->ok) continue;
    const upright::design::BrokenLoop open =
        upright::design::LoopAtWheels(set.plant, report->measurement, report->controller);
    PrintLoop((std::string(name) + " one wheel").c_str(), LoopAtInput(open, 0), 0, &first);
    PrintLoop((std::string(name) + " common mode").c_str(), CommonModeLoop(open), 0, &first);
    if (report->sampled_loop.sampled()) {
      const upright::design::BrokenLoop& s = report->sampled_loop;
      PrintLoop((std::string(name) + " one wheel sampled").c_str(), LoopAtInput(s, 0),
                s.period_s, &first);
      PrintLoop((std::string(name) + " common mode sampled").c_str(), CommonModeLoop(s),
                s.period_s, &first);
    }
  }
  std::printf("], \"pushes\": [\n");
  first = true;
  for (const auto& [name, report] : controllers) {
    if (!report->ok) continue;
    const StateSpace pushed =
        upright::design::PushedLoop(set.plant, report->measurement, report->controller);
    const auto response = upright::design::ResponseToPush(pushed, current, set.design_push);
    if (!response) {
      std::fprintf(stderr, "%s: %s\n", name, response.error().c_str());
      return 1;
    }
    std::printf("%s{\"name\": \"%s\", \"peak_N\": %.17g, \"duration_s\": %.17g, ",
                first ? "" : ", ", name, set.design_push.peak_N(), set.design_push.duration_s);
    PrintMatrix("A", pushed.A);
    std::printf(", ");
    PrintMatrix("B", pushed.B);
    std::printf(", ");
    PrintMatrix("C", pushed.C);
    std::printf(", \"current_per_input\": %.17g, ", current.per_input);
    PrintMatrix("current_per_state", current.per_state);
    std::printf(", ");
    PrintList("time_s", response->time_s);
    std::printf(", ");
    PrintList("pitch_rad", response->pitch_rad);
    std::printf(", ");
    PrintList("position_m", response->position_m);
    std::printf(", ");
    PrintList("current_left_A", response->current_left_A);
    std::printf("}\n");
    first = false;
  }
  std::printf("]}\n");
  return 0;
}
