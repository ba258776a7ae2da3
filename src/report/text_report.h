// The human report of a solve: a summary block (status, iterations, residuals, demand, inflow
// from each source), warnings, then every node and every link, in the file's unit system.
// Returns text; only the command line prints.
#pragma once

#include <string>

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
std::string solve_report_text(const Network& network, const SolveResult& result,
                              const std::string& file, const ReportOptions& options = {});

}  // namespace gradeline
