#include "solver/link_batch.h"

#include "hydraulics/colebrook_batch.h"

namespace gradeline {

void LinkBatch::clear() {
  items_.clear();
  first_item_.clear();
  re_.clear();
  rr_.clear();
  x_.clear();
  batch_item_.clear();
}

void LinkBatch::add_item(const PipeLaw& law, double flow_m3s, double* colebrook_x) {
  double reynolds = 0.0;
  if (needs_colebrook(law, flow_m3s, &reynolds)) {
    batch_item_.push_back(static_cast<std::uint32_t>(items_.size()));
    re_.push_back(reynolds);
    rr_.push_back(law.relative_roughness);
    x_.push_back(*colebrook_x);
    items_.push_back({&law, flow_m3s, colebrook_x, LinkEval{}});
  } else if (law.kind == LawKind::kDarcyWeisbach && reynolds <= kLaminarLimitRe) {
    items_.push_back({&law, flow_m3s, colebrook_x, laminar_pipe(law, flow_m3s, reynolds)});
  } else {
    items_.push_back({&law, flow_m3s, colebrook_x, evaluate_pipe(law, flow_m3s, colebrook_x)});
  }
}

void LinkBatch::add_link(const PipeLaw& law, double flow_m3s, double* colebrook_x) {
  first_item_.push_back(static_cast<std::uint32_t>(items_.size()));
  add_item(law, flow_m3s, colebrook_x);
}

void LinkBatch::add_chain(ChainLaws* chains, std::size_t c, double flow_m3s) {
  first_item_.push_back(static_cast<std::uint32_t>(items_.size()));
  for (std::uint32_t i = chains->start[c]; i < chains->start[c + 1]; ++i) {
    add_item(chains->law[i], flow_m3s - chains->offset_m3s[i], &chains->colebrook_x[i]);
  }
}

void LinkBatch::evaluate() {
  const std::size_t n = re_.size();
  f_.resize(n);
  df_.resize(n);
  colebrook_batch(n, re_.data(), rr_.data(), x_.data(), f_.data(), df_.data());
  for (std::size_t j = 0; j < n; ++j) {
    Item& item = items_[batch_item_[j]];
    *item.colebrook_x = x_[j];
    item.eval = turbulent_pipe(*item.law, item.flow_m3s, re_[j], f_[j], df_[j]);
  }
  // A link of one item is that item's evaluation; a chain sums its pipes' in order, as
  // ChainLaws::evaluate does (for a chain of one pipe the sums equal the pipe's own h and
  // dh/dQ, and the solver reads nothing else of a chain).
  const std::size_t links = first_item_.size();
  results_.resize(links);
  for (std::size_t i = 0; i < links; ++i) {
    const std::size_t begin = first_item_[i];
    const std::size_t end = i + 1 < links ? first_item_[i + 1] : items_.size();
    if (end == begin + 1) {
      results_[i] = items_[begin].eval;
      continue;
    }
    LinkEval sum;
    for (std::size_t j = begin; j < end; ++j) {
      sum.headloss_m += items_[j].eval.headloss_m;
      sum.dh_dq += items_[j].eval.dh_dq;
    }
    results_[i] = sum;
  }
}

}  // namespace gradeline
