#include "design/sizing.h"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <limits>

#include "design/design_memo.h"

namespace gradeline {
namespace {

using Design = std::vector<int>;  // per candidate pipe: index into its options

// What the search remembers of a trial design.
struct Evaluation {
  bool feasible = false;
  double margin_m = -std::numeric_limits<double>::infinity();  // worst pressure margin
};

// What the report needs of the chosen design.
struct Details {
  std::vector<std::pair<std::string, double>> min_pressure_m;
  std::vector<Violation> violations;
};

void set_size(Pipe* p, const CatalogueItem& item) {
  p->diameter_m = item.diameter_m;
  if (item.roughness_m) p->roughness_m = item.roughness_m;
  if (item.cfactor) p->cfactor = item.cfactor;
}

class Sizer {
 public:
  Sizer(const Network& net, const Catalogue& cat, const SizingProblem& problem)
      : net_(net), cat_(cat), problem_(problem), work_(net) {
    for (std::size_t pipe : problem.pipes) {
      options_.push_back(size_options(net, pipe, cat, problem.new_pipes));
    }
  }
  SizingResult run();

 private:
  double cost(const Design& d) const {
    double c = 0.0;
    for (std::size_t i = 0; i < d.size(); ++i) c += options_[i][d[i]].cost;
    return c;
  }
  const Evaluation& evaluate(const Design& d);
  Evaluation solve_design(const Design& d, Details* details);
  Design greedy_descent(Design d, int frozen = -1, int frozen2 = -1);
  Design greedy_ascent(Design d);
  Design local_search(Design d);
  Design triple_search(Design d);
  Design enumerate();
  Design perturb(Design d);

  void explain(const Design& d, SizingResult* out);

  const Network& net_;
  const Catalogue& cat_;
  const SizingProblem& problem_;
  Network work_;  // the network with the trial sizes
  std::vector<std::vector<SizeOption>> options_;
  DesignMemo<Evaluation> memo_{problem_.pipes.size()};
  SolverSession session_;                          // one topology: analyse once
  std::vector<std::vector<double>> last_flows_;    // per case: warm start for the next trial
  long long solves_ = 0;
  long long solves_to_best_ = 0;  // solves spent when the cheapest feasible design was first met
  double best_cost_ = std::numeric_limits<double>::infinity();
};

const Evaluation& Sizer::evaluate(const Design& d) {
  if (const Evaluation* known = memo_.find(d)) return *known;
  Evaluation e = solve_design(d, nullptr);
  if (e.feasible && cost(d) < best_cost_) {
    best_cost_ = cost(d);
    solves_to_best_ = solves_;
  }
  if (problem_.progress && solves_ % 200 == 0) problem_.progress(solves_, best_cost_);
  return memo_.insert(d, e);
}

Evaluation Sizer::solve_design(const Design& d, Details* details) {
  for (std::size_t i = 0; i < d.size(); ++i) {
    const std::size_t k = problem_.pipes[i];
    const SizeOption& o = options_[i][d[i]];
    const Pipe& original = net_.pipes[k];
    Pipe& p = work_.pipes[k];
    p.diameter_m = original.diameter_m;
    p.roughness_m = original.roughness_m;
    p.cfactor = original.cfactor;
    if (o.item >= 0) set_size(&p, cat_.items[o.item]);
  }
  Evaluation e;
  e.feasible = true;
  e.margin_m = std::numeric_limits<double>::infinity();
  last_flows_.resize(problem_.cases.size());
  for (std::size_t ci = 0; ci < problem_.cases.size(); ++ci) {
    const DemandCase& c = problem_.cases[ci];
    const std::vector<double>* warm = last_flows_[ci].empty() ? nullptr : &last_flows_[ci];
    // A trial's violations are listed only for the report; the search needs only whether any.
    CaseOutcome o = run_case(work_, c, problem_.solve_options, problem_.criteria, &session_, warm,
                             details != nullptr);
    solves_ += 1;
    if (!o.result.summary.converged()) {
      e.feasible = false;
      e.margin_m = -std::numeric_limits<double>::infinity();
      break;
    }
    last_flows_[ci].resize(o.result.links.size());
    for (std::size_t k = 0; k < o.result.links.size(); ++k) last_flows_[ci][k] = o.result.links[k].flow_m3s;
    double lowest = std::numeric_limits<double>::infinity();
    for (std::size_t n = 0; n < work_.nodes.size(); ++n) {
      const NodeState& ns = o.result.nodes[n];
      if (work_.nodes[n].is_fixed_head() || !ns.supplied) continue;
      lowest = std::min(lowest, ns.pressure_m);
      if (o.criteria.min_pressure_m) e.margin_m = std::min(e.margin_m, ns.pressure_m - *o.criteria.min_pressure_m);
    }
    if (details ? !o.violations.empty() : any_violation(work_, o.result, o.criteria)) {
      e.feasible = false;
    }
    if (details) {
      details->min_pressure_m.emplace_back(c.name, lowest);
      details->violations.insert(details->violations.end(), o.violations.begin(), o.violations.end());
    }
  }
  return e;
}

// From a feasible design, step pipes down one size while the design stays feasible, each time
// taking the step that saves most per metre of pressure margin it uses.
// `frozen` pipes (those a kick just pushed up) keep their sizes.
Design Sizer::greedy_descent(Design d, int frozen, int frozen2) {
  Design t;  // each candidate in turn: assigned, not constructed, so no allocation per candidate
  for (;;) {
    const double margin = evaluate(d).margin_m;
    int best = -1;
    double best_score = -1.0;
    for (std::size_t i = 0; i < d.size(); ++i) {
      if (d[i] == 0 || static_cast<int>(i) == frozen || static_cast<int>(i) == frozen2) continue;
      t = d;
      --t[i];
      const Evaluation& e = evaluate(t);
      if (!e.feasible) continue;
      const double saving = cost(d) - cost(t);
      const double score = saving / std::max(margin - e.margin_m, 1e-6);
      if (score > best_score) {
        best_score = score;
        best = static_cast<int>(i);
      }
    }
    if (best < 0) return d;
    --d[best];
  }
}

// From the cheapest design, step pipes up one size until feasible, each time taking the step
// that gains most margin per unit of cost.
Design Sizer::greedy_ascent(Design d) {
  Design t;  // each candidate in turn: assigned, not constructed, so no allocation per candidate
  while (!evaluate(d).feasible) {
    const double margin = evaluate(d).margin_m;
    int best = -1;
    double best_score = -std::numeric_limits<double>::infinity();
    for (std::size_t i = 0; i < d.size(); ++i) {
      if (d[i] + 1 >= static_cast<int>(options_[i].size())) continue;
      t = d;
      ++t[i];
      const double gain = evaluate(t).margin_m - margin;
      const double score = gain / std::max(cost(t) - cost(d), 1e-9);
      if (score > best_score) {
        best_score = score;
        best = static_cast<int>(i);
      }
    }
    if (best < 0) return d;
    ++d[best];
  }
  return d;
}

// First-improvement search over single-pipe changes of any size and pair changes of up to
// `reach` sizes each way, until no such move lowers the cost of a feasible design.
Design Sizer::local_search(Design d) {
  Design t;  // each candidate in turn: assigned, not constructed, so no allocation per candidate
  if (!evaluate(d).feasible) return d;
  const int reach = d.size() > 20 ? 1 : d.size() > 10 ? 3 : 14;
  bool improved = true;
  while (improved) {
    improved = false;
    const double current = cost(d);
    for (std::size_t i = 0; i < d.size() && !improved; ++i) {
      for (int j = 0; j < static_cast<int>(options_[i].size()) && !improved; ++j) {
        t = d;
        t[i] = j;
        if (cost(t) < current - 1e-9 && evaluate(t).feasible) {
          d = t;
          improved = true;
        }
      }
    }
    for (std::size_t i = 0; i < d.size() && !improved; ++i) {
      for (std::size_t k = i + 1; k < d.size() && !improved; ++k) {
        for (int a = -reach; a <= reach && !improved; ++a) {
          for (int b = -reach; b <= reach && !improved; ++b) {
            t = d;
            t[i] += a;
            t[k] += b;
            if (t[i] < 0 || t[k] < 0 || t[i] >= static_cast<int>(options_[i].size()) ||
                t[k] >= static_cast<int>(options_[k].size()) || (a == 0 && b == 0)) {
              continue;
            }
            if (cost(t) < current - 1e-9 && evaluate(t).feasible) {
              d = t;
              improved = true;
            }
          }
        }
      }
    }
  }
  return d;
}

// First-improvement search over changes of three pipes at once, each by up to `reach` sizes
// either way; only moves that lower the cost are solved. This finds trades such as one main
// up a size paying for two others down a size, which pair moves cannot reach.
Design Sizer::triple_search(Design d) {
  Design t;  // each candidate in turn: assigned, not constructed, so no allocation per candidate
  if (!evaluate(d).feasible) return d;
  const int n = static_cast<int>(d.size());
  const int reach = n > 12 ? 1 : 2;
  bool improved = true;
  while (improved && solves_ < 600000) {
    improved = false;
    const double current = cost(d);
    for (int i = 0; i < n && !improved; ++i) {
      for (int j = i + 1; j < n && !improved; ++j) {
        for (int k = j + 1; k < n && !improved; ++k) {
          for (int a = -reach; a <= reach && !improved; ++a) {
            for (int b = -reach; b <= reach && !improved; ++b) {
              for (int c = -reach; c <= reach && !improved; ++c) {
                if (a == 0 || b == 0 || c == 0) continue;  // pair moves cover those
                t = d;
                t[i] += a;
                t[j] += b;
                t[k] += c;
                if (t[i] < 0 || t[j] < 0 || t[k] < 0 || t[i] >= static_cast<int>(options_[i].size()) ||
                    t[j] >= static_cast<int>(options_[j].size()) ||
                    t[k] >= static_cast<int>(options_[k].size())) {
                  continue;
                }
                if (cost(t) < current - 1e-9 && evaluate(t).feasible) {
                  d = local_search(t);
                  improved = true;
                }
              }
            }
          }
        }
      }
    }
  }
  return d;
}

// Iterated local search: from the best design, push one pipe up one to three sizes (or two
// pipes up one size each), search locally again, and keep what is cheaper; stop when no kick
// helps or the solve budget is spent.
Design Sizer::perturb(Design d) {
  constexpr long long kSolveBudget = 400000;
  struct Kick {
    Design design;
    int frozen, frozen2;  // the pushed pipes, held at their new sizes during the first descent
  };
  bool improved = true;
  while (improved && solves_ < kSolveBudget) {
    improved = false;
    const double current = cost(d);
    std::vector<Kick> kicks;
    for (std::size_t i = 0; i < d.size(); ++i) {
      for (int k = 1; k <= 3; ++k) {
        Design t = d;
        t[i] += k;
        if (t[i] < static_cast<int>(options_[i].size())) kicks.push_back({t, static_cast<int>(i), -1});
      }
    }
    for (std::size_t i = 0; i < d.size(); ++i) {
      for (std::size_t m = i + 1; m < d.size(); ++m) {
        Design t = d;
        ++t[i];
        ++t[m];
        if (t[i] < static_cast<int>(options_[i].size()) && t[m] < static_cast<int>(options_[m].size()))
          kicks.push_back({t, static_cast<int>(i), static_cast<int>(m)});
      }
    }
    for (const Kick& kick : kicks) {
      if (solves_ >= kSolveBudget) break;
      Design t = local_search(greedy_descent(greedy_descent(kick.design, kick.frozen, kick.frozen2)));
      if (evaluate(t).feasible && cost(t) < current - 1e-9) {
        d = t;
        improved = true;
        break;
      }
    }
  }
  return d;
}

Design Sizer::enumerate() {
  Design d(options_.size(), 0), best;
  double best_cost = std::numeric_limits<double>::infinity();
  for (;;) {
    const double c = cost(d);
    if (c < best_cost && evaluate(d).feasible) {
      best_cost = c;
      best = d;
    }
    std::size_t i = 0;
    while (i < d.size() && ++d[i] == static_cast<int>(options_[i].size())) d[i++] = 0;
    if (i == d.size()) break;
  }
  return best;
}

void Sizer::explain(const Design& d, SizingResult* out) {
  for (std::size_t i = 0; i < d.size(); ++i) {
    const SizeOption& o = options_[i][d[i]];
    if (o.item < 0) continue;  // unchanged
    const std::size_t k = problem_.pipes[i];
    PipeChange ch;
    ch.pipe = k;
    if (!problem_.new_pipes) ch.from_diameter_m = net_.pipes[k].diameter_m;
    ch.item = o.item;
    ch.cost = o.cost;
    if (d[i] > 0) {
      Design t = d;
      --t[i];
      ch.smaller_item = options_[i][t[i]].item;
      ch.saving_if_smaller = o.cost - options_[i][t[i]].cost;
      const Evaluation& e = evaluate(t);
      ch.margin_if_smaller_m = e.margin_m;
    }
    out->changes.push_back(ch);
  }
}

constexpr long long kMultiStartBudget = 150000;

SizingResult Sizer::run() {
  auto start = std::chrono::steady_clock::now();
  SizingResult out;
  long long designs = 1;
  for (const auto& o : options_) {
    designs = designs > problem_.enumeration_limit ? designs : designs * static_cast<long long>(o.size());
  }
  Design top(options_.size());
  for (std::size_t i = 0; i < top.size(); ++i) top[i] = static_cast<int>(options_[i].size()) - 1;
  Design best;
  if (!evaluate(top).feasible) {
    best = top;  // best effort: everything at the largest size allowed
    out.method = "none (infeasible at the largest sizes)";
  } else if (designs <= problem_.enumeration_limit) {
    best = enumerate();
    out.method = "enumeration of " + std::to_string(designs) + " designs";
  } else {
    Design a = local_search(greedy_descent(top));
    Design b = local_search(greedy_ascent(Design(options_.size(), 0)));
    best = evaluate(b).feasible && cost(b) < cost(a) ? b : a;
    best = perturb(best);
    // Multi-start: greedy descent from every design with one pipe fixed at one size and the
    // rest at their largest, then local search.
    for (std::size_t i = 0; i < options_.size() && solves_ < kMultiStartBudget; ++i) {
      for (int j = 0; j + 1 < static_cast<int>(options_[i].size()); ++j) {
        Design start = top;
        start[i] = j;
        if (!evaluate(start).feasible) continue;
        Design t = greedy_descent(start);
        if (cost(t) > 1.05 * cost(best)) continue;  // only promising descents are polished
        t = local_search(t);
        if (evaluate(t).feasible && cost(t) < cost(best) - 1e-9) best = t;
      }
    }
    // Then alternate three-pipe exchanges and kicks until neither lowers the cost.
    for (;;) {
      const double before = cost(best);
      best = perturb(triple_search(best));
      if (cost(best) >= before - 1e-9) break;
    }
    out.method = "greedy descent and ascent, local search with kicks, multi-start descent, three-pipe exchanges";
  }
  Details details;
  const Evaluation e = solve_design(best, &details);
  out.feasible = e.feasible;
  out.cost = cost(best);
  out.min_pressure_m = details.min_pressure_m;
  out.min_margin_m = e.margin_m;
  if (!e.feasible) out.remaining = details.violations;
  explain(best, &out);
  out.solves = solves_;
  out.solves_to_best = solves_to_best_;
  out.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  return out;
}

}  // namespace

std::vector<SizeOption> size_options(const Network& net, std::size_t pipe, const Catalogue& cat,
                                     bool new_pipe) {
  std::vector<SizeOption> out;
  const Pipe& p = net.pipes[pipe];
  if (!new_pipe) out.push_back({-1, p.diameter_m, 0.0});
  for (std::size_t i = 0; i < cat.items.size(); ++i) {
    const CatalogueItem& item = cat.items[i];
    if (!new_pipe && item.diameter_m < p.diameter_m) continue;
    out.push_back({static_cast<int>(i), item.diameter_m,
                   item.cost_per_m * p.length_m + cat.mobilisation_cost});
  }
  return out;
}

SizingResult size_pipes(const Network& net, const Catalogue& cat, const SizingProblem& problem) {
  return Sizer(net, cat, problem).run();
}

Network apply_sizes(const Network& net, const Catalogue& cat, const std::vector<PipeChange>& changes) {
  Network out = net;
  for (const PipeChange& c : changes) set_size(&out.pipes[c.pipe], cat.items[c.item]);
  return out;
}

}  // namespace gradeline
