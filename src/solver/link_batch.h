// The laws of many links evaluated together: every Darcy-Weisbach pipe in turbulent flow among
// them, whether a link of its own or a pipe of a series chain, gets its friction factor from one
// colebrook_batch call (four pipes at a time where the processor allows), the others one by one
// through evaluate_pipe. Each link's result is what evaluate_pipe, or ChainLaws::evaluate for a
// chain, gives, but for Colebrook's root, which agrees to about 1e-15 relative
// (hydraulics/colebrook_batch.h); a link's result never depends on the others evaluated with it.
// Nothing is allocated once the buffers have grown to the largest block seen.
#pragma once

#include <cstddef>
#include <cstdint>
#include <vector>

#include "hydraulics/chain_law.h"
#include "hydraulics/link_law.h"

namespace gradeline {

class LinkBatch {
 public:
  void clear();
  // Adds a link: a pipe, pump or valve law at flow Q with its Colebrook warm start (for a
  // pipe), or chain c of `chains` at chain flow Q (its pipes' warm starts are in `chains`).
  void add_link(const PipeLaw& law, double flow_m3s, double* colebrook_x);
  void add_chain(ChainLaws* chains, std::size_t c, double flow_m3s);
  // Evaluates every link added since clear(); result(i) is then the i-th one's evaluation.
  void evaluate();
  const LinkEval& result(std::size_t i) const { return results_[i]; }

 private:
  struct Item {  // one pipe, pump or valve law at one flow
    const PipeLaw* law;
    double flow_m3s;
    double* colebrook_x;
    LinkEval eval;
  };
  void add_item(const PipeLaw& law, double flow_m3s, double* colebrook_x);

  std::vector<Item> items_;
  std::vector<std::uint32_t> first_item_;  // per link added: its first item
  std::vector<LinkEval> results_;
  // The Colebrook batch: Re, e/D, x (in and out), f, df/dRe, and the item of each.
  std::vector<double> re_, rr_, x_, f_, df_;
  std::vector<std::uint32_t> batch_item_;
};

}  // namespace gradeline
