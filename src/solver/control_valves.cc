#include "solver/control_valves.h"

namespace gradeline {

ControlValves::ControlValves(const Network& net)
    : net_(net), mode_(net.pipes.size(), ValveMode::kNone), changes_(net.pipes.size(), 0) {
  for (std::size_t k = 0; k < net.pipes.size(); ++k) {
    const Pipe& p = net.pipes[k];
    if (!p.is_control_valve()) continue;
    valves_.push_back(k);
    mode_[k] = p.kind == LinkKind::kPsv ? ValveMode::kOpen : ValveMode::kActive;
  }
}

void ControlValves::override_losses(const std::vector<double>& head,
                                    std::vector<double>* headloss) const {
  for (std::size_t k : valves_) {
    if (mode_[k] != ValveMode::kActive) continue;
    const Pipe& p = net_.pipes[k];
    switch (p.kind) {
      case LinkKind::kPrv: (*headloss)[k] = head[p.from] - p.control().valve_head_m; break;  // -> H_j - H_set
      case LinkKind::kPsv: (*headloss)[k] = p.control().valve_head_m - head[p.to]; break;    // -> H_set - H_i
      default: (*headloss)[k] = head[p.from] - head[p.to]; break;                  // flow-fixed
    }
  }
}

void ControlValves::fix_flows(std::vector<double>* flow) const {
  for (std::size_t k : valves_) {
    if (mode_[k] == ValveMode::kActive && net_.pipes[k].kind == LinkKind::kFcv) {
      (*flow)[k] = net_.pipes[k].control().valve_flow_m3s;
    }
  }
}

void ControlValves::assemble(const AssemblyPlan& plan, const std::vector<char>& link_active,
                             Eigen::VectorXd* rhs, SymmetricMatrix* matrix) const {
  double* v = matrix->valuePtr();
  for (std::size_t k : valves_) {
    if (mode_[k] != ValveMode::kActive || !link_active[k]) continue;
    const Pipe& p = net_.pipes[k];
    if (p.kind == LinkKind::kFcv) continue;  // its fixed flow is already in the ordinary terms
    const std::size_t pinned = p.kind == LinkKind::kPrv ? p.to : p.from;
    const int u = plan.unknown_of_node[pinned];
    if (u < 0) continue;
    v[plan.diagonal_slot[u]] += kValvePinConductance;
    (*rhs)[u] += kValvePinConductance * p.control().valve_head_m;
  }
}

void ControlValves::update_flows(const std::vector<char>& link_active,
                                 const std::vector<double>& head, std::vector<double>* flow) const {
  for (std::size_t k : valves_) {
    if (mode_[k] != ValveMode::kActive || !link_active[k]) continue;
    const Pipe& p = net_.pipes[k];
    if (p.kind == LinkKind::kPrv) {
      (*flow)[k] += kValvePinConductance * (p.control().valve_head_m - head[p.to]);
    } else if (p.kind == LinkKind::kPsv) {
      (*flow)[k] += kValvePinConductance * (head[p.from] - p.control().valve_head_m);
    } else {
      (*flow)[k] = p.control().valve_flow_m3s;
    }
  }
}

bool ControlValves::release_floating(const AssemblyPlan& plan, const SymmetricMatrix& matrix,
                                     const std::vector<char>& supplied) {
  const double* v = matrix.valuePtr();
  bool changed = false;
  for (std::size_t k : valves_) {
    if (mode_[k] != ValveMode::kActive) continue;
    const Pipe& p = net_.pipes[k];
    for (std::size_t node : {p.from, p.to}) {
      const int u = plan.unknown_of_node[node];
      if (u >= 0 && supplied[node] && v[plan.diagonal_slot[u]] == 0.0) {
        mode_[k] = ValveMode::kOpen;
        ++changes_[k];
        changed = true;
        break;
      }
    }
  }
  return changed;
}

bool ControlValves::update_modes(const std::vector<char>& supplied, const std::vector<double>& head,
                                 const std::vector<double>& flow, double htol, double qtol) {
  bool changed = false;
  for (std::size_t k : valves_) {
    const Pipe& p = net_.pipes[k];
    if (p.status == LinkStatus::kClosed || changes_[k] >= kMaxValveModeChanges) continue;
    const bool up_ok = supplied[p.from], down_ok = supplied[p.to];
    const double hi = head[p.from], hj = head[p.to], q = flow[k], set = p.control().valve_head_m;
    const bool forward_drive = up_ok && (!down_ok || hi > hj + htol);
    ValveMode next = mode_[k];
    switch (p.kind) {
      case LinkKind::kPrv:
        if (mode_[k] == ValveMode::kActive) {
          if (q < -qtol) next = ValveMode::kClosed;
          else if (up_ok && hi < set - htol) next = ValveMode::kOpen;
        } else if (mode_[k] == ValveMode::kOpen) {
          if (q < -qtol) next = ValveMode::kClosed;
          else if (down_ok && hj > set + htol) next = ValveMode::kActive;
        } else if (forward_drive && (!down_ok || hj < set - htol)) {
          next = hi > set + htol ? ValveMode::kActive : ValveMode::kOpen;
        }
        break;
      case LinkKind::kPsv:
        if (mode_[k] == ValveMode::kActive) {
          if (q < -qtol) next = ValveMode::kClosed;
          else if (down_ok && hj > set + htol) next = ValveMode::kOpen;
        } else if (mode_[k] == ValveMode::kOpen) {
          if (q < -qtol) next = ValveMode::kClosed;
          else if (up_ok && hi < set - htol) next = ValveMode::kActive;
        } else if (forward_drive && hi > set + htol) {
          next = down_ok && hj > set + htol ? ValveMode::kOpen : ValveMode::kActive;
        }
        break;
      default:  // FCV
        if (mode_[k] == ValveMode::kActive) {
          if (up_ok && down_ok && hi < hj - htol) next = ValveMode::kOpen;
        } else if (mode_[k] == ValveMode::kOpen) {
          if (q > p.control().valve_flow_m3s + qtol) next = ValveMode::kActive;
          else if (q < -qtol) next = ValveMode::kClosed;
        } else if (forward_drive) {
          next = ValveMode::kOpen;
        }
        break;
    }
    if (next != mode_[k]) {
      mode_[k] = next;
      ++changes_[k];
      changed = true;
    }
  }
  return changed;
}

bool ControlValves::consistent(const std::vector<char>& supplied, const std::vector<double>& head,
                               const std::vector<double>& flow, double htol, double qtol,
                               std::string* why) const {
  for (std::size_t k : valves_) {
    const Pipe& p = net_.pipes[k];
    if (p.status == LinkStatus::kClosed || !supplied[p.from]) continue;
    const double hi = head[p.from], hj = head[p.to], q = flow[k], set = p.control().valve_head_m;
    const std::string name = std::string(link_kind_name(p.kind)) + " '" + p.id + "'";
    const ValveMode m = mode_[k];
    bool bad = false;
    if (m != ValveMode::kClosed && q < -qtol) bad = true;
    if (p.kind == LinkKind::kPrv) {
      if (m == ValveMode::kActive && hi < set - htol) bad = true;
      if (m == ValveMode::kOpen && hj > set + htol) bad = true;
    } else if (p.kind == LinkKind::kPsv) {
      if (m == ValveMode::kActive && hj > set + htol) bad = true;
      if (m == ValveMode::kOpen && hi < set - htol) bad = true;
    } else {
      if (m == ValveMode::kActive && hi < hj - htol) bad = true;
      if (m == ValveMode::kOpen && q > p.control().valve_flow_m3s + qtol) bad = true;
    }
    if (m == ValveMode::kClosed && supplied[p.to] && hi > hj + htol) {
      // Closed although forward flow would be wanted: below its setting downstream (PRV), above
      // it upstream (PSV), or any forward head (FCV).
      if (p.kind == LinkKind::kPrv && hj < set - htol) bad = true;
      if (p.kind == LinkKind::kPsv && hi > set + htol) bad = true;
      if (p.kind == LinkKind::kFcv) bad = true;
    }
    if (bad) {
      *why = name + " is " + valve_mode_name(m) + ", which the final heads and flows contradict";
      return false;
    }
  }
  return true;
}

const char* valve_mode_name(ValveMode m) {
  switch (m) {
    case ValveMode::kNone: return "none";
    case ValveMode::kActive: return "active";
    case ValveMode::kOpen: return "open";
    case ValveMode::kClosed: return "closed";
  }
  return "none";
}

}  // namespace gradeline
