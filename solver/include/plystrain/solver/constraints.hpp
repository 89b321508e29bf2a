// Elimination of constraints: the model's physical variables z (nodal
// displacements, then e3 for generalized plane strain) as an affine function
// of the reduced unknowns q and of scalar load signals s(lambda):
//     z = T q + G s(lambda).
// Prescribed values, rigid-face rotations and multi-point constraint values
// are signals; rigid-face translations are extra unknowns in q. A variable
// that is free maps to exactly one q with coefficient 1, so the common
// Dirichlet-only case is a plain selection.
#pragma once

#include <Eigen/Core>

#include <functional>
#include <span>
#include <string>
#include <vector>

namespace plystrain::solver {

using Signal = std::function<double(double load_factor)>;

// One term of an affine row: coefficient * unknown (or * signal).
struct AffineTerm {
  int index = 0;
  double coefficient = 0.0;
};

class ConstraintSet {
 public:
  // variable_count: size of z. extra_unknowns: unknowns that are not
  // variables themselves (rigid-face translations), numbered
  // variable_count, variable_count + 1, ...
  ConstraintSet(int variable_count, int extra_unknowns);

  // z[variable] = signal(lambda). Throws std::invalid_argument if the
  // variable is no longer free (constrained twice).
  void prescribe(int variable, Signal signal, const std::string& what);

  // z[variable] = unknown + signal(lambda), unknown being an extra unknown
  // or a free variable.
  void follow(int variable, int unknown, Signal signal, const std::string& what);

  // sum coefficient_i z[variable_i] = signal(lambda). The slave is the free
  // unknown with the largest coefficient after substitution of the earlier
  // constraints. Throws if none is left (redundant or conflicting).
  void add_linear(const std::vector<AffineTerm>& terms, Signal signal, const std::string& what);

  [[nodiscard]] bool is_free(int unknown) const;

  // Resolves everything; afterwards the accessors below are valid.
  void finish();

  [[nodiscard]] int variable_count() const { return variable_count_; }
  [[nodiscard]] int reduced_count() const { return reduced_count_; }
  [[nodiscard]] int signal_count() const { return static_cast<int>(signals_.size()); }

  // Row of T for a variable (terms over q) and of G (terms over signals).
  [[nodiscard]] std::span<const AffineTerm> reduced_row(int variable) const;
  [[nodiscard]] std::span<const AffineTerm> signal_row(int variable) const;
  // q index of an extra unknown or free variable (-1 when eliminated).
  [[nodiscard]] int reduced_index(int unknown) const;

  [[nodiscard]] Eigen::VectorXd signal_values(double load_factor) const;
  // z = T q + G s(lambda).
  [[nodiscard]] Eigen::VectorXd expand(const Eigen::VectorXd& q, double load_factor) const;
  // T^T r for a vector r over the variables.
  [[nodiscard]] Eigen::VectorXd reduce(const Eigen::VectorXd& r) const;
  // True when every row of T has at most one term with coefficient 1.
  [[nodiscard]] bool is_selection() const { return selection_; }

 private:
  struct Definition {
    bool defined = false;
    std::vector<AffineTerm> unknowns;  // over unknowns
    std::vector<AffineTerm> signals;
  };
  void resolve(int unknown, std::vector<AffineTerm>& unknowns, std::vector<AffineTerm>& signals,
               double scale) const;
  void define(int unknown, Definition definition, const std::string& what);

  int variable_count_ = 0;
  int unknown_count_ = 0;
  int reduced_count_ = 0;
  bool finished_ = false;
  bool selection_ = true;
  std::vector<Definition> definitions_;
  std::vector<Signal> signals_;
  std::vector<int> reduced_index_;
  std::vector<int> row_start_, signal_start_;
  std::vector<AffineTerm> rows_, signal_rows_;
};

}  // namespace plystrain::solver
