// The sections of the report, one per kind of results folder: a folder and its manifest in, HTML,
// contents entries and inputs appended to the page out. Each fails ("<path>:<line>: ...") when a
// results file cannot be read or parsed.
#pragma once

#include <string>

#include "manifest_info.hpp"
#include "report_page.hpp"
#include "results_folder.hpp"
#include "upright/base/result.hpp"
#include "upright/runner/report/report.hpp"

namespace upright::runner::internal {

// `upright run` / `demo`: the ranking, then per scenario the time plots of the first seed's
// traces, the summary and comparison tables and the linear-vs-physics gap.
Status AppendRunSection(const ResultsFolder& folder, const ManifestInfo& manifest,
                        const ReportOptions& options, ReportPage* page);

// `upright envelope`: the envelope bars and, when present, the survival maps.
Status AppendEnvelopeSection(const ResultsFolder& folder, const ManifestInfo& manifest,
                             ReportPage* page);

// `upright sweep`: survival rates with their Wilson intervals, and the spreads sampled.
Status AppendSweepSection(const ResultsFolder& folder, const ManifestInfo& manifest,
                          ReportPage* page);

// `upright design --report`: each design's margins, the Bode and Nyquist plots of its loop at the
// wheels (one wheel, both alike; continuous and sampled) and its linear push response.
Status AppendDesignSection(const ResultsFolder& folder, const ManifestInfo& manifest,
                           const ReportOptions& options, ReportPage* page);

// `upright tune`: each controller's best objective over the search, default against tuned, and
// the ranking at their best beside the ranking as designed.
Status AppendTuneSection(const ResultsFolder& folder, const ManifestInfo& manifest,
                         const ReportOptions& options, ReportPage* page);

}  // namespace upright::runner::internal
