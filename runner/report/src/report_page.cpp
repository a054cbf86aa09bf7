#include "report_page.hpp"

#include <algorithm>
#include <filesystem>

#include "html_text.hpp"

namespace upright::runner::internal {
namespace {

// Styles inline in the page: no stylesheet to fetch. Colours repeat what symbols and words say.
constexpr const char* kStyle = R"(
body{font-family:"DejaVu Sans",Arial,Helvetica,sans-serif;font-size:14px;color:#111;margin:0 auto;
  max-width:1260px;padding:0 16px 40px;line-height:1.4}
h1{font-size:24px;margin:18px 0 6px}
h2{font-size:20px;margin:30px 0 8px;border-bottom:2px solid #333;padding-bottom:2px}
h3{font-size:16px;margin:22px 0 6px}h4{font-size:14px;margin:14px 0 4px}
.caution{border:2px solid #000;background:#fff7d6;padding:8px 12px;margin:10px 0}
.scroll{overflow-x:auto;margin:6px 0 12px}table{border-collapse:collapse;font-size:12px}
caption{text-align:left;font-weight:bold;padding:4px 0}
th,td{border:1px solid #bbb;padding:2px 6px;text-align:left;vertical-align:top;white-space:nowrap}
th{background:#eee}td.num,th.num{text-align:right;font-variant-numeric:tabular-nums}
td.better{background:#e3f1e3}td.worse{background:#f8e1dc}td.bad{background:#f8e1dc}
td.na{color:#666}code,.hash{font-family:"DejaVu Sans Mono",monospace;font-size:11px}
.figures{display:flex;flex-wrap:wrap;gap:10px 18px}
svg{max-width:100%;height:auto;font-size:11px;background:#fff}svg text{fill:#111}
svg .title{font-weight:bold;font-size:12px}svg .note{font-size:10px;fill:#333}
svg .grid{stroke:#e2e2e2}svg .zero{stroke:#999}svg .frame{fill:none;stroke:#777}
svg .baseline{stroke:#777}svg .event line{stroke:#666;stroke-dasharray:3 3}
svg .event text{font-size:10px;fill:#444}svg .mark path{fill:none}
svg .mark text{paint-order:stroke;stroke:#fff;stroke-width:3px;stroke-linejoin:round}
svg .reference line{stroke:#333;stroke-dasharray:5 3}
svg .cross{fill:none;stroke:#000;stroke-width:2.2}svg .whisker{stroke:#000;stroke-width:1.5}
svg .bar{fill-opacity:.85}svg .plant{fill:#555;stroke:#000}
svg .linear{fill:#fff;stroke:#000;stroke-dasharray:3 2}svg .all{fill:#1b5e20}
svg .some{fill:#fff;stroke:#1b5e20;stroke-width:1.5}svg .notrun{font-weight:bold;font-size:15px}
svg .cell-all{fill:#e3f1e3;stroke:#fff}svg .cell-some{fill:#f3f3e0;stroke:#fff}
svg .cell-none{fill:#f6f6f6;stroke:#fff}nav ol{margin:4px 0;padding-left:22px}.muted{color:#555}
)";

}  // namespace

void AddManifestInputs(const ManifestInfo& manifest, ReportPage* page) {
  if (!manifest.tool_version.empty() &&
      std::find(page->tool_versions.begin(), page->tool_versions.end(), manifest.tool_version) ==
          page->tool_versions.end()) {
    page->tool_versions.push_back(manifest.tool_version);
  }
  const auto add = [&](const char* kind, const std::string& name, const std::string& path,
                       const std::string& sha256) {
    if (path.empty()) return;
    const std::string normal = std::filesystem::path(path).lexically_normal().string();
    for (const InputFile& f : page->inputs) {
      if (f.kind == kind && f.path == normal && f.sha256 == sha256) return;
    }
    page->inputs.push_back({kind, name, normal, sha256});
  };
  for (const ManifestScenario& s : manifest.scenarios) {
    add("robot model", s.model_name, s.model_path, s.model_sha256);
  }
  for (const ManifestScenario& s : manifest.scenarios) add("scenario", s.name, s.path, s.sha256);
}

std::string AnchorId(std::string_view prefix, std::string_view text) {
  std::string id(prefix);
  for (const char c : text) {
    const bool kept = (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') ||
                      c == '_' || c == '-';
    id += kept ? c : '-';
  }
  return id;
}

std::string PageHtml(const ReportPage& page) {
  std::string html =
      "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"/>"
      "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\"/>"
      "<title>upright report: " +
      Escape(page.title) + "</title><style>" + kStyle + "</style></head>\n<body>\n<header>";
  html += "<h1>upright report: " + Escape(page.title) + "</h1>";
  html +=
      "<p class=\"caution\" role=\"note\"><strong>Caution.</strong> " + Escape(kCaution) + "</p>";

  std::vector<std::string> robots;
  for (const InputFile& f : page.inputs) {
    if (f.kind == "robot model" &&
        std::find(robots.begin(), robots.end(), f.name) == robots.end()) {
      robots.push_back(f.name);
    }
  }
  const auto joined = [](const std::vector<std::string>& items) {
    std::string text;
    for (const std::string& item : items) text += (text.empty() ? "" : ", ") + item;
    return text.empty() ? std::string("not recorded (no manifest.json)") : text;
  };
  std::vector<std::string> versions;
  for (const std::string& v : page.tool_versions) versions.push_back("upright " + v);
  html += "<table><tbody>";
  html += "<tr><th>results folder</th><td>" + Escape(page.title) + "</td></tr>";
  html += "<tr><th>robot(s)</th><td>" + Escape(joined(robots)) + "</td></tr>";
  html += "<tr><th>results made by</th><td>" + Escape(joined(versions)) + "</td></tr>";
  html += std::string("<tr><th>report made by</th><td>upright ") + UPRIGHT_REPORT_VERSION +
          "</td></tr>";
  html += "</tbody></table>";

  if (!page.inputs.empty()) {
    html +=
        "<h2 id=\"inputs\">Input files</h2><p>As recorded in the manifests: each file and the "
        "SHA-256 of its bytes when the results were made.</p><div class=\"scroll\"><table>"
        "<thead><tr><th>kind</th><th>name</th><th>file</th><th>SHA-256</th></tr></thead>"
        "<tbody>";
    for (const InputFile& f : page.inputs) {
      html += "<tr><td>" + Escape(f.kind) + "</td><td>" + Escape(f.name) + "</td><td><code>" +
              Escape(f.path) + "</code></td><td class=\"hash\">" + Escape(f.sha256) + "</td></tr>";
    }
    html += "</tbody></table></div>";
  }

  html += "<nav><h2 id=\"contents\">Contents</h2><ol>";
  bool open_sublist = false;
  for (std::size_t i = 0; i < page.toc.size(); ++i) {
    const TocEntry& e = page.toc[i];
    if (e.level == 1) {
      if (open_sublist) html += "</ol></li>";
      if (i > 0 && !open_sublist) html += "</li>";
      open_sublist = false;
      html += "<li><a href=\"#" + Escape(e.id) + "\">" + Escape(e.text) + "</a>";
    } else {
      if (!open_sublist) html += "<ol>";
      open_sublist = true;
      html += "<li><a href=\"#" + Escape(e.id) + "\">" + Escape(e.text) + "</a></li>";
    }
  }
  if (open_sublist) html += "</ol>";
  if (!page.toc.empty()) html += "</li>";
  html += "</ol></nav></header>\n<main>\n" + page.body + "</main>\n";
  html += "<footer><p class=\"caution\" role=\"note\"><strong>Caution.</strong> " +
          Escape(kCaution) + "</p></footer>\n</body></html>\n";
  return html;
}

}  // namespace upright::runner::internal
