// A plain genetic algorithm for least-cost sizing, as the baseline `gradeline size` is measured
// against (docs/sizing.md). It follows the usual simple GA of the design literature (Simpson,
// Dandy & Murphy 1994; Savic & Walters 1997): one gene per pipe holding a catalogue index,
// tournament selection of two, one-point crossover with probability 0.9, per-gene random
// mutation with probability 1/pipes, elitism of one, and a penalty on the pressure deficit:
//   fitness = cost + penalty_per_m * sum over nodes and cases of max(0, min pressure - p).
// Every design is solved with the same solver and session `size` uses.
//   build/gradeline_ga NETWORK CATALOGUE [EVALUATIONS] [SEED] [POPULATION] [PENALTY_PER_M]
// Treats every pipe as new. Prints one line: best feasible cost, the evaluation at which it
// was found, evaluations, solves and seconds.
#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <limits>
#include <random>
#include <string>
#include <unordered_map>
#include <vector>

#include "analysis/case_run.h"
#include "design/catalogue.h"
#include "design/sizing.h"
#include "io/parser.h"
#include "model/demand_cases.h"

using namespace gradeline;

namespace {

using Genome = std::vector<int>;

struct Scored {
  double fitness = 0.0;
  double cost = 0.0;
  bool feasible = false;
};

class Problem {
 public:
  Problem(const Network& net, const Catalogue& cat, double penalty_per_m)
      : net_(net), cat_(cat), work_(net), cases_(cases_of(net)), penalty_per_m_(penalty_per_m) {}

  std::size_t genes() const { return net_.pipes.size(); }
  int sizes() const { return static_cast<int>(cat_.items.size()); }
  long long solves() const { return solves_; }

  Scored score(const Genome& g) {
    auto it = memo_.find(g);
    if (it != memo_.end()) return it->second;
    Scored s;
    for (std::size_t k = 0; k < g.size(); ++k) {
      const CatalogueItem& item = cat_.items[g[k]];
      Pipe& p = work_.pipes[k];
      p.diameter_m = item.diameter_m;
      if (item.roughness_m) p.roughness_m = item.roughness_m;
      if (item.cfactor) p.cfactor = item.cfactor;
      s.cost += item.cost_per_m * p.length_m + cat_.mobilisation_cost;
    }
    double deficit_m = 0.0;
    bool solved = true;
    for (const DemandCase& c : cases_) {
      CaseOutcome o = run_case(work_, c, SolveOptions{}, CriteriaOverride{}, &session_);
      ++solves_;
      if (!o.result.summary.converged()) {
        solved = false;
        break;
      }
      if (!o.criteria.min_pressure_m) continue;
      for (std::size_t n = 0; n < work_.nodes.size(); ++n) {
        if (work_.nodes[n].is_fixed_head()) continue;
        deficit_m += std::max(0.0, *o.criteria.min_pressure_m - o.result.nodes[n].pressure_m);
      }
    }
    s.feasible = solved && deficit_m == 0.0;
    s.fitness = solved ? s.cost + penalty_per_m_ * deficit_m : std::numeric_limits<double>::max();
    memo_.emplace(g, s);
    return s;
  }

 private:
  const Network& net_;
  const Catalogue& cat_;
  Network work_;
  std::vector<DemandCase> cases_;
  double penalty_per_m_;
  SolverSession session_;
  std::unordered_map<Genome, Scored, DesignHash> memo_;
  long long solves_ = 0;
};

}  // namespace

int main(int argc, char** argv) {
  if (argc < 3) {
    std::fprintf(stderr,
                 "usage: gradeline_ga NETWORK CATALOGUE [EVALUATIONS] [SEED] [POPULATION] "
                 "[PENALTY_PER_M]\n");
    return 2;
  }
  const long long evaluations = argc > 3 ? std::atoll(argv[3]) : 100000;
  const unsigned seed = argc > 4 ? static_cast<unsigned>(std::atoi(argv[4])) : 1u;
  const int population = argc > 5 ? std::atoi(argv[5]) : 100;
  ParseResult parsed = parse_network_file(argv[1]);
  if (!parsed.ok()) {
    for (const auto& e : parsed.errors) std::fprintf(stderr, "%s\n", e.format().c_str());
    return 2;
  }
  CatalogueResult cat = parse_catalogue_file(argv[2], parsed.network.headloss.law);
  if (!cat.ok()) {
    for (const auto& e : cat.errors) std::fprintf(stderr, "%s\n", e.format().c_str());
    return 2;
  }
  // Default penalty: the dearest catalogue item over the longest pipe, per metre of deficit.
  double longest_m = 0.0;
  for (const Pipe& p : parsed.network.pipes) longest_m = std::max(longest_m, p.length_m);
  const double penalty = argc > 6 ? std::atof(argv[6])
                                  : cat.catalogue.items.back().cost_per_m * longest_m;
  Problem problem(parsed.network, cat.catalogue, penalty);
  std::mt19937_64 rng(seed);
  std::uniform_int_distribution<int> any_size(0, problem.sizes() - 1);
  std::uniform_real_distribution<double> unit(0.0, 1.0);
  const auto start = std::chrono::steady_clock::now();

  std::vector<Genome> pop(population, Genome(problem.genes()));
  for (Genome& g : pop) {
    for (int& v : g) v = any_size(rng);
  }
  double best_cost = std::numeric_limits<double>::infinity();
  long long found_at = 0, evaluated = 0;
  Genome best;
  std::vector<Scored> score(population);
  auto assess = [&](std::size_t i) {
    score[i] = problem.score(pop[i]);
    ++evaluated;
    if (score[i].feasible && score[i].cost < best_cost) {
      best_cost = score[i].cost;
      found_at = evaluated;
      best = pop[i];
    }
  };
  for (std::size_t i = 0; i < pop.size(); ++i) assess(i);
  std::uniform_int_distribution<int> pick(0, population - 1);
  auto tournament = [&]() -> const Genome& {
    const int a = pick(rng), b = pick(rng);
    return score[a].fitness <= score[b].fitness ? pop[a] : pop[b];
  };
  const double mutation = 1.0 / static_cast<double>(problem.genes());
  std::uniform_int_distribution<std::size_t> cut(1, problem.genes() - 1);
  while (evaluated < evaluations) {
    const std::size_t elite =
        std::min_element(score.begin(), score.end(),
                         [](const Scored& x, const Scored& y) { return x.fitness < y.fitness; }) -
        score.begin();
    std::vector<Genome> next{pop[elite]};
    while (static_cast<int>(next.size()) < population) {
      Genome a = tournament(), b = tournament();
      if (unit(rng) < 0.9) {
        const std::size_t c = cut(rng);
        for (std::size_t k = c; k < a.size(); ++k) std::swap(a[k], b[k]);
      }
      for (Genome* g : {&a, &b}) {
        for (int& v : *g) {
          if (unit(rng) < mutation) v = any_size(rng);
        }
        if (static_cast<int>(next.size()) < population) next.push_back(*g);
      }
    }
    pop.swap(next);
    score[0] = problem.score(pop[0]);
    for (std::size_t i = 1; i < pop.size() && evaluated < evaluations; ++i) assess(i);
  }
  const double seconds =
      std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  std::printf("ga best_cost=%.0f found_at=%lld evaluations=%lld solves=%lld seconds=%.2f seed=%u\n",
              best_cost, found_at, evaluated, problem.solves(), seconds, seed);
  std::printf("design");
  for (int v : best) std::printf(" %s", cat.catalogue.items[v].id.c_str());
  std::printf("\n");
  return 0;
}
