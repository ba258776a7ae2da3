// The human report of a solve: a summary block (status, iterations, residuals, demand, inflow
// from each source), warnings, then every node and every link, in the file's unit system.
// The text goes to a sink piece by piece, or comes back whole; only the command line prints.
#pragma once

#include <functional>
#include <string>
#include <string_view>

#include "gradeline/network.h"
#include "gradeline/solve_summary.h"

namespace gradeline {

// Velocity above which a main is flagged (common practice for distribution mains: 2-3 m/s).
inline constexpr double kHighVelocity_ms = 3.0;

inline constexpr const char* kCaution =
    "Caution: these results support, and do not replace, the judgement of a licensed engineer\n"
    "and the local codes, above all where low pressure or fire protection is at stake.\n";

struct ReportOptions {
  bool tables = true;          // false: summary and warnings only
  std::string case_name;       // shown in the summary when not empty
  std::string criteria_block;  // criteria and violations, shown after the summary
};

std::string solve_summary_text(const Network& network, const SolveResult& result,
                               const std::string& file, const std::string& case_name = "");
// Receives the report's text in order, a piece at a time.
using TextSink = std::function<void(std::string_view)>;

// The report, piece by piece: the tables of a large network are formed in blocks on every
// core and handed over as they are done, so a million-element report is never held whole.
void write_solve_report(const Network& network, const SolveResult& result, const std::string& file,
                        const ReportOptions& options, const TextSink& sink);
// The same text as one string.
std::string solve_report_text(const Network& network, const SolveResult& result,
                              const std::string& file, const ReportOptions& options = {});

}  // namespace gradeline
