// The section of an `upright design --report` folder: the margins of each design, the Bode and
// Nyquist plots of its loop at the wheels, and its linear response to the design push.
#include <algorithm>
#include <cmath>
#include <filesystem>
#include <numbers>

#include "html_table.hpp"
#include "html_text.hpp"
#include "line_plot.hpp"
#include "sections.hpp"
#include "upright/base/number_text.hpp"
#include "upright/runner/report/csv_reader.hpp"

namespace upright::runner::internal {
namespace {

namespace fs = std::filesystem;

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
// Nyquist points farther than this from the origin are left out of the path: they lie far
// beyond the plotted window, and leaving them out keeps the SVG's numbers small.
constexpr double kNyquistReach = 1e3;

// A CSV file read with the columns it must have; the missing column named.
struct Columns {
  CsvTable table;
  std::vector<int> index;
};

Result<Columns> ReadWithColumns(const std::string& path, const std::vector<const char*>& names) {
  Result<CsvTable> read = ReadCsvFile(path);
  if (!read) return Failure(read.error());
  Columns c;
  c.table = std::move(*read);
  for (const char* name : names) {
    const int column = c.table.Column(name);
    if (column < 0) return Failure(path + ":1: no column '" + name + "' in the header");
    c.index.push_back(column);
  }
  return c;
}

// The controllers in the order the margins list them: their colours across the section.
std::size_t StyleOf(std::vector<std::string>* order, const std::string& controller) {
  const auto it = std::find(order->begin(), order->end(), controller);
  if (it != order->end()) return static_cast<std::size_t>(it - order->begin());
  order->push_back(controller);
  return order->size() - 1;
}

// A horizontal guide at `y` over [x0, x1].
PlotSeries Level(double y, double x0, double x1) {
  PlotSeries s;
  s.guide = true;
  s.time_s = {x0, x1};
  s.value = {y, y};
  return s;
}

// What a loop name means, for titles.
std::string LoopWords(const std::string& loop) {
  return loop == "one_wheel" ? "one wheel (left; right closed)" : "both wheels alike";
}

struct LoopCurves {
  std::string controller;
  bool sampled = false;
  std::vector<double> omega, magnitude_db, phase_deg, re, im;
};

// Bode magnitude and phase and the Nyquist plot of one loop for every controller.
void AppendLoopPlots(const std::vector<LoopCurves>& curves, const std::string& loop,
                     const std::string& robot, std::vector<std::string>* order,
                     const ReportOptions& options, std::string* html) {
  const std::string words = LoopWords(loop);
  LinePlot magnitude, phase, nyquist;
  for (LinePlot* p : {&magnitude, &phase, &nyquist}) {
    p->scenario = robot;
    p->twin_legend = "as the module runs it: sampled, with the latency (dotted)";
  }
  magnitude.kind = "design-bode-magnitude-" + loop;
  magnitude.title = "Loop gain, " + words;
  magnitude.y_label = "|L| (dB)";
  magnitude.x_label = "frequency (rad/s)";
  magnitude.x_log10 = true;
  phase.kind = "design-bode-phase-" + loop;
  phase.title = "Loop phase, " + words;
  phase.y_label = "phase of L (deg)";
  phase.x_label = "frequency (rad/s)";
  phase.x_log10 = true;
  nyquist.kind = "design-nyquist-" + loop;
  nyquist.title = "Nyquist plot, " + words + ": L(jω) near −1";
  nyquist.y_label = "imaginary part";
  nyquist.x_label = "real part";
  nyquist.x_lo = -3;
  nyquist.x_hi = 1;
  nyquist.y_lo = -1;
  nyquist.y_hi = 1;
  nyquist.equal_aspect = true;
  nyquist.height_px = 470;
  double w_lo = std::numeric_limits<double>::infinity(), w_hi = 0;
  double phase_lo = 0, phase_hi = 0;
  for (const LoopCurves& c : curves) {
    const std::size_t style = StyleOf(order, c.controller);
    const std::string name = c.controller;
    magnitude.series.push_back({name, style, c.sampled, c.omega, c.magnitude_db});
    phase.series.push_back({name, style, c.sampled, c.omega, c.phase_deg});
    // ω from −∞ to ∞: the mirror image (negative frequencies) first, then the curve itself.
    PlotSeries n{name, style, c.sampled, {}, {}};
    for (int mirror : {1, 0}) {
      for (std::size_t k = 0; k < c.re.size(); ++k) {
        const std::size_t i = mirror ? c.re.size() - 1 - k : k;
        const bool near = std::hypot(c.re[i], c.im[i]) <= kNyquistReach;
        n.time_s.push_back(near ? c.re[i] : kNaN);
        n.value.push_back(near ? (mirror ? -c.im[i] : c.im[i]) : kNaN);
      }
    }
    nyquist.series.push_back(std::move(n));
    for (std::size_t i = 0; i < c.omega.size(); ++i) {
      w_lo = std::min(w_lo, c.omega[i]);
      w_hi = std::max(w_hi, c.omega[i]);
      if (std::isfinite(c.phase_deg[i])) {
        phase_lo = std::min(phase_lo, c.phase_deg[i]);
        phase_hi = std::max(phase_hi, c.phase_deg[i]);
      }
    }
  }
  if (w_lo < w_hi) {
    magnitude.series.push_back(Level(0, w_lo, w_hi));
    // −180° and its turns within the phase plotted: where the phase margin is read.
    for (double level = -180 + 360 * std::ceil((phase_lo + 180) / 360); level <= phase_hi;
         level += 360) {
      phase.series.push_back(Level(level, w_lo, w_hi));
    }
  }
  // The unit circle and a cross at −1.
  PlotSeries circle;
  circle.guide = true;
  for (int k = 0; k <= 120; ++k) {
    const double a = 2 * std::numbers::pi * k / 120;
    circle.time_s.push_back(std::cos(a));
    circle.value.push_back(std::sin(a));
  }
  nyquist.series.push_back(std::move(circle));
  nyquist.marks.push_back({-1, 0, 0, "−1"});
  for (const LinePlot* p : {&magnitude, &phase, &nyquist}) {
    *html += RenderLinePlot(*p, options.max_points);
  }
}

// Every curve of loop_response.csv, grouped by loop, in file order.
Result<std::vector<std::pair<std::string, std::vector<LoopCurves>>>> ReadLoops(
    const std::string& path) {
  const Result<Columns> read = ReadWithColumns(path, {"controller", "loop", "model", "omega_rad_s",
                                                      "magnitude_db", "phase_deg", "real", "imag"});
  if (!read) return Failure(read.error());
  const std::vector<int>& c = read->index;
  std::vector<std::pair<std::string, std::vector<LoopCurves>>> loops;
  for (const auto& row : read->table.rows) {
    const std::string& loop = row[c[1]];
    auto group =
        std::find_if(loops.begin(), loops.end(), [&](const auto& g) { return g.first == loop; });
    if (group == loops.end()) {
      loops.push_back({loop, {}});
      group = loops.end() - 1;
    }
    const bool sampled = row[c[2]] == "sampled";
    std::vector<LoopCurves>& curves = group->second;
    if (curves.empty() || curves.back().controller != row[c[0]] ||
        curves.back().sampled != sampled) {
      curves.push_back({row[c[0]], sampled, {}, {}, {}, {}, {}});
    }
    LoopCurves& curve = curves.back();
    curve.omega.push_back(CsvNumber(row[c[3]]));
    curve.magnitude_db.push_back(CsvNumber(row[c[4]]));
    curve.phase_deg.push_back(CsvNumber(row[c[5]]));
    curve.re.push_back(CsvNumber(row[c[6]]));
    curve.im.push_back(CsvNumber(row[c[7]]));
  }
  return loops;
}

// Pitch, position and current over time under the design push, with the ground-contact tilt and
// the current limit as guides.
Status AppendPushPlots(const std::string& path, const ManifestDesign& design,
                       const std::string& robot, std::vector<std::string>* order,
                       const ReportOptions& options, std::string* html) {
  const Result<Columns> read =
      ReadWithColumns(path, {"controller", "time_s", "pitch_deg", "position_m", "current_left_A"});
  if (!read) return Failure(read.error());
  const std::vector<int>& c = read->index;
  LinePlot pitch, position, current;
  pitch.kind = "design-push-pitch";
  pitch.title = "Pitch under the design push (linear model)";
  pitch.y_label = "pitch (deg)";
  position.kind = "design-push-position";
  position.title = "Position under the design push (linear model)";
  position.y_label = "position (m)";
  current.kind = "design-push-current";
  current.title = "Left motor current under the design push (linear model)";
  current.y_label = "current (A)";
  for (LinePlot* p : {&pitch, &position, &current}) p->scenario = robot;
  double end_s = 0;
  for (const auto& row : read->table.rows) {
    const std::size_t style = StyleOf(order, row[c[0]]);
    const auto add = [&](LinePlot* plot, int column) {
      if (plot->series.empty() || plot->series.back().name != row[c[0]]) {
        plot->series.push_back({row[c[0]], style, false, {}, {}});
      }
      plot->series.back().time_s.push_back(CsvNumber(row[c[1]]));
      plot->series.back().value.push_back(CsvNumber(row[column]));
    };
    add(&pitch, c[2]);
    add(&position, c[3]);
    add(&current, c[4]);
    end_s = std::max(end_s, CsvNumber(row[c[1]]));
  }
  if (std::isfinite(design.ground_contact_backward_deg)) {
    pitch.series.push_back(Level(-design.ground_contact_backward_deg, 0, end_s));
  }
  if (std::isfinite(design.current_limit_A)) {
    current.series.push_back(Level(design.current_limit_A, 0, end_s));
    current.series.push_back(Level(-design.current_limit_A, 0, end_s));
  }
  for (const LinePlot* p : {&pitch, &position, &current}) {
    *html += RenderLinePlot(*p, options.max_points);
  }
  return {};
}

// The margins table: one row per controller, loop and model.
Result<std::string> MarginsTable(const std::string& path) {
  const Result<Columns> read = ReadWithColumns(
      path, {"controller", "status", "reason", "loop", "model", "gain_low", "gain_high",
             "phase_deg", "crossover_rad_s", "delay_ms", "disk_alpha"});
  if (!read) return Failure(read.error());
  const std::vector<int>& c = read->index;
  HtmlTable table({"controller", "status", "loop", "as", "gain margin, low", "gain margin, high",
                   "phase margin (deg)", "at (rad/s)", "delay margin (ms)", "disk α"},
                  {false, false, false, false, true, true, true, true, true, true});
  for (const auto& row : read->table.rows) {
    const bool made = !row[c[3]].empty();
    std::vector<HtmlCell> cells = {
        {row[c[0]], false, ""},
        {row[c[1]], false, ""},
        {made ? (row[c[3]] == "one_wheel" ? "one wheel (the worse of the two)"
                                          : LoopWords(row[c[3]]))
              : row[c[2]],
         false, ""},
        {row[c[4]] == "sampled" ? "sampled, with the latency" : row[c[4]], false, ""}};
    for (int k = 5; k <= 10; ++k) cells.push_back(NumberCell(row[c[k]]));
    table.AddRow(std::move(cells));
  }
  return table.Html();
}

std::string Figure(double value, const char* unit) {
  return SignificantText(value, 3, NanAs::kEmpty) + unit;
}

}  // namespace

Status AppendDesignSection(const ResultsFolder& folder, const ManifestInfo& manifest,
                           const ReportOptions& options, ReportPage* page) {
  const fs::path dir(folder.path);
  const std::string robot =
      manifest.scenarios.empty() ? std::string() : manifest.scenarios.front().model_name;
  const ManifestDesign& d = manifest.design;
  const std::string section_id = folder.id + "design";
  const std::string heading = "Design: " + (robot.empty() ? folder.relative : robot);
  page->toc.push_back({section_id, heading, 1});
  std::string html = "<section><h2 id=\"" + section_id + "\">" + Escape(heading) + "</h2>";
  html += "<p>The built-in designs of <code>upright design</code> on the robot's linear model (" +
          Escape(d.input) + " input; the modules run at " + Figure(d.rate_hz, " Hz") +
          " and read sensors " + Figure(d.latency_s * 1e3, " ms") +
          " old). The loop is broken at the wheel inputs, L under negative feedback: "
          "<em>one wheel</em> is the left wheel's loop with the right one closed, as the margins "
          "of one wheel at a time read it; <em>both wheels alike</em> is the loop of both wheels "
          "driven together (their common mode, the balance loop), which a gain, phase or delay "
          "on both wheels at once acts on. Solid lines: the continuous design; dotted: the loop "
          "as the module runs it, sampled at its rate with the latency, up to the Nyquist "
          "frequency. The robot falls without control, so the Nyquist plot of a stable loop "
          "circles −1 (the cross) once counter-clockwise for each unstable pole of L (the "
          "Nyquist criterion); the dashed circle is |L| = 1, where the phase margin is "
          "read. In the table the sampled loop's delay margin is the delay it takes beyond the "
          "latency, and PID's loop is not analysed sampled.</p>";
  const Result<std::string> margins = MarginsTable((dir / "margins.csv").string());
  if (!margins) return Failure(margins.error());
  html += *margins;
  std::vector<std::string> order;
  const auto loops = ReadLoops((dir / "loop_response.csv").string());
  if (!loops) return Failure(loops.error());
  for (const auto& [loop, curves] : *loops) {
    html += "<h3 id=\"" + AnchorId(section_id + "-", loop) + "\">Loop at the wheels, " +
            Escape(LoopWords(loop)) + "</h3>";
    AppendLoopPlots(curves, loop, robot, &order, options, &html);
  }
  html += "<h3 id=\"" + section_id + "-push\">The design push on the linear model</h3>";
  html += "<p>A half-sine push along +x of " + Figure(d.push_peak_N, " N") + " peak over " +
          Figure(d.push_duration_s, " s") + " (" + Figure(d.push_impulse_Ns, " N s") + ") at " +
          Figure(d.push_height_m, " m") +
          " above the axle, from rest, on the continuous linear loop: no contact, slip, motor "
          "limits, sampling, latency or PID's clamp on its commanded lean. Dashed: the tilt at "
          "which the chassis touches the ground "
          "leaning back (" +
          Figure(d.ground_contact_backward_deg, "°") + ") and the current limit (" +
          Figure(d.current_limit_A, " A") + ").</p>";
  if (Status pushed =
          AppendPushPlots((dir / "push_response.csv").string(), d, robot, &order, options, &html);
      !pushed) {
    return pushed;
  }
  html += "</section>\n";
  page->body += html;
  return {};
}

}  // namespace upright::runner::internal
