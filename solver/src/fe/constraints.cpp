#include "plystrain/solver/constraints.hpp"

#include <algorithm>
#include <cmath>
#include <map>
#include <stdexcept>

namespace plystrain::solver {
namespace {

// Sums terms with equal index and drops exact zeros, sorted by index.
std::vector<AffineTerm> compress(std::vector<AffineTerm> terms) {
  std::map<int, double> sum;
  for (const AffineTerm& t : terms) {
    sum[t.index] += t.coefficient;
  }
  std::vector<AffineTerm> out;
  for (const auto& [index, coefficient] : sum) {
    if (coefficient != 0.0) {
      out.push_back({index, coefficient});
    }
  }
  return out;
}

}  // namespace

ConstraintSet::ConstraintSet(int variable_count, int extra_unknowns)
    : variable_count_(variable_count),
      unknown_count_(variable_count + extra_unknowns),
      definitions_(static_cast<std::size_t>(variable_count + extra_unknowns)) {}

bool ConstraintSet::is_free(int unknown) const {
  return !definitions_.at(static_cast<std::size_t>(unknown)).defined;
}

void ConstraintSet::define(int unknown, Definition definition, const std::string& what) {
  if (finished_) {
    throw std::logic_error("constraint set: no constraints may be added after finish()");
  }
  if (unknown < 0 || unknown >= unknown_count_) {
    throw std::invalid_argument(what + ": unknown index " + std::to_string(unknown) + " out of range");
  }
  if (!is_free(unknown)) {
    throw std::invalid_argument(what + ": variable " + std::to_string(unknown) +
                                " is already constrained (a value is constrained twice)");
  }
  definition.defined = true;
  definitions_[static_cast<std::size_t>(unknown)] = std::move(definition);
}

void ConstraintSet::prescribe(int variable, Signal signal, const std::string& what) {
  Definition d;
  d.signals.push_back({static_cast<int>(signals_.size()), 1.0});
  signals_.push_back(std::move(signal));
  define(variable, std::move(d), what);
}

void ConstraintSet::follow(int variable, int unknown, Signal signal, const std::string& what) {
  Definition d;
  d.unknowns.push_back({unknown, 1.0});
  d.signals.push_back({static_cast<int>(signals_.size()), 1.0});
  signals_.push_back(std::move(signal));
  define(variable, std::move(d), what);
}

void ConstraintSet::resolve(int unknown, std::vector<AffineTerm>& unknowns,
                            std::vector<AffineTerm>& signals, double scale) const {
  const Definition& d = definitions_[static_cast<std::size_t>(unknown)];
  if (!d.defined) {
    unknowns.push_back({unknown, scale});
    return;
  }
  for (const AffineTerm& s : d.signals) {
    signals.push_back({s.index, scale * s.coefficient});
  }
  for (const AffineTerm& u : d.unknowns) {
    resolve(u.index, unknowns, signals, scale * u.coefficient);
  }
}

void ConstraintSet::add_linear(const std::vector<AffineTerm>& terms, Signal signal,
                               const std::string& what) {
  std::vector<AffineTerm> unknowns, signals;
  for (const AffineTerm& t : terms) {
    if (t.index < 0 || t.index >= unknown_count_) {
      throw std::invalid_argument(what + ": variable index out of range");
    }
    resolve(t.index, unknowns, signals, t.coefficient);
  }
  unknowns = compress(std::move(unknowns));
  double largest = 0.0;
  for (const AffineTerm& u : unknowns) {
    largest = std::max(largest, std::abs(u.coefficient));
  }
  // The largest coefficient gives the best-conditioned elimination. Among
  // equal ones the unknown written first is eliminated: a caller tying many
  // nodes to one reference node (u_i - u_ref = c) then gets one short
  // definition per node. (Choosing by index instead could eliminate the
  // reference node and chain every later constraint through the earlier
  // ones, growing each definition with all earlier signals.)
  auto rank = [&terms](int index) {
    for (std::size_t k = 0; k < terms.size(); ++k) {
      if (terms[k].index == index) {
        return static_cast<int>(k);
      }
    }
    return static_cast<int>(terms.size());  // reached through an earlier definition
  };
  auto slave = unknowns.end();
  for (auto it = unknowns.begin(); it != unknowns.end(); ++it) {
    if (!(std::abs(it->coefficient) > 1e-12 * largest)) {
      continue;
    }
    if (slave == unknowns.end() || std::abs(it->coefficient) > std::abs(slave->coefficient) ||
        (std::abs(it->coefficient) == std::abs(slave->coefficient) && rank(it->index) < rank(slave->index))) {
      slave = it;
    }
  }
  if (slave == unknowns.end()) {
    throw std::invalid_argument(what + ": the constraint involves no free unknown any more "
                                       "(redundant with, or contradicting, earlier constraints)");
  }
  // slave = (signal - other signals - sum others) / a_s
  const double a = slave->coefficient;
  Definition d;
  d.signals.push_back({static_cast<int>(signals_.size()), 1.0 / a});
  signals_.push_back(std::move(signal));
  for (const AffineTerm& s : signals) {
    d.signals.push_back({s.index, -s.coefficient / a});
  }
  for (auto it = unknowns.begin(); it != unknowns.end(); ++it) {
    if (it != slave) {
      d.unknowns.push_back({it->index, -it->coefficient / a});
    }
  }
  define(slave->index, std::move(d), what);
}

void ConstraintSet::finish() {
  reduced_index_.assign(static_cast<std::size_t>(unknown_count_), -1);
  reduced_count_ = 0;
  for (int u = 0; u < unknown_count_; ++u) {
    if (is_free(u)) {
      reduced_index_[static_cast<std::size_t>(u)] = reduced_count_++;
    }
  }
  row_start_.assign(1, 0);
  signal_start_.assign(1, 0);
  rows_.clear();
  signal_rows_.clear();
  selection_ = true;
  for (int v = 0; v < variable_count_; ++v) {
    std::vector<AffineTerm> unknowns, signals;
    resolve(v, unknowns, signals, 1.0);
    unknowns = compress(std::move(unknowns));
    signals = compress(std::move(signals));
    if (unknowns.size() > 1 || (unknowns.size() == 1 && unknowns[0].coefficient != 1.0)) {
      selection_ = false;
    }
    for (const AffineTerm& u : unknowns) {
      rows_.push_back({reduced_index_[static_cast<std::size_t>(u.index)], u.coefficient});
    }
    signal_rows_.insert(signal_rows_.end(), signals.begin(), signals.end());
    row_start_.push_back(static_cast<int>(rows_.size()));
    signal_start_.push_back(static_cast<int>(signal_rows_.size()));
  }
  finished_ = true;
}

std::span<const AffineTerm> ConstraintSet::reduced_row(int variable) const {
  const auto begin = static_cast<std::size_t>(row_start_[static_cast<std::size_t>(variable)]);
  const auto end = static_cast<std::size_t>(row_start_[static_cast<std::size_t>(variable) + 1]);
  return std::span<const AffineTerm>(rows_.data() + begin, end - begin);
}

std::span<const AffineTerm> ConstraintSet::signal_row(int variable) const {
  const auto begin = static_cast<std::size_t>(signal_start_[static_cast<std::size_t>(variable)]);
  const auto end = static_cast<std::size_t>(signal_start_[static_cast<std::size_t>(variable) + 1]);
  return std::span<const AffineTerm>(signal_rows_.data() + begin, end - begin);
}

int ConstraintSet::reduced_index(int unknown) const {
  return reduced_index_.at(static_cast<std::size_t>(unknown));
}

Eigen::VectorXd ConstraintSet::signal_values(double load_factor) const {
  Eigen::VectorXd s(static_cast<Eigen::Index>(signals_.size()));
  for (std::size_t i = 0; i < signals_.size(); ++i) {
    s(static_cast<Eigen::Index>(i)) = signals_[i](load_factor);
  }
  return s;
}

Eigen::VectorXd ConstraintSet::expand(const Eigen::VectorXd& q, double load_factor) const {
  const Eigen::VectorXd s = signal_values(load_factor);
  Eigen::VectorXd z = Eigen::VectorXd::Zero(variable_count_);
  for (int v = 0; v < variable_count_; ++v) {
    double value = 0.0;
    for (const AffineTerm& t : reduced_row(v)) {
      value += t.coefficient * q(t.index);
    }
    for (const AffineTerm& t : signal_row(v)) {
      value += t.coefficient * s(t.index);
    }
    z(v) = value;
  }
  return z;
}

Eigen::VectorXd ConstraintSet::reduce(const Eigen::VectorXd& r) const {
  Eigen::VectorXd out = Eigen::VectorXd::Zero(reduced_count_);
  for (int v = 0; v < variable_count_; ++v) {
    for (const AffineTerm& t : reduced_row(v)) {
      out(t.index) += t.coefficient * r(v);
    }
  }
  return out;
}

}  // namespace plystrain::solver
