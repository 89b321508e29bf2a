// The reduced tangent's sparsity pattern, built once per model, and each
// block's (cell's or loaded edge's) scatter plan into the value array, so an
// evaluation only zeroes the values and adds block matrices into known slots.
#pragma once

#include "plystrain/solver/constraints.hpp"
#include "plystrain/solver/nonlinear_contract.hpp"

#include <span>
#include <vector>

namespace plystrain::solver {

// One thread's share of a parallel scatter: the matrix columns and the
// variables whose run of `width` consecutive indices falls to it in turn.
// Every matrix entry and every variable has exactly one owner, and each
// owner adds its blocks in block order, so the sums are formed in the same
// order for any number of shares (bitwise-identical results). Runs rather
// than halves: the blocks of one chunk touch a narrow band of columns, which
// one half would own entirely.
struct ScatterShare {
  int index = 0;
  int count = 1;
  static constexpr int width = 32;
  [[nodiscard]] bool owns(int column) const { return count == 1 || (column / width) % count == index; }
};

class AssemblyPattern {
 public:
  AssemblyPattern() = default;

  // blocks[b] lists the variables (indices into z) of block b in its local
  // order. The pattern is that of T^T K T over all blocks.
  AssemblyPattern(const ConstraintSet& constraints, const std::vector<std::vector<int>>& blocks);

  // The pattern with zero values (compressed, both triangles).
  [[nodiscard]] const SparseMatrix& pattern() const { return pattern_; }

  // Makes `matrix` carry this pattern (copied only when it differs) without
  // touching its values: the caller zeroes them (in parallel) before the
  // scatter.
  void adopt_pattern(SparseMatrix& matrix) const;

  // values += T_b^T K_b T_b for block b, the share's columns only; K_b is
  // column-major, n x n, n the block's variable count.
  void scatter_matrix(int block, const double* block_matrix, int n, double* values,
                      ScatterShare share = {}) const;

  // r_z += r_b over the share's variables (the reduction by T^T happens once
  // at the end).
  void scatter_vector(int block, const double* block_vector, int n, Eigen::VectorXd& variables,
                      ScatterShare share = {}) const;

  [[nodiscard]] int block_count() const { return static_cast<int>(blocks_.size()); }
  [[nodiscard]] std::span<const int> block_variables(int block) const;
  [[nodiscard]] std::size_t slot_count() const;  // memory of the plans, in entries

 private:
  struct GeneralEntry {
    int local = 0;  // a + n b (column-major in the block matrix)
    int slot = 0;
    int column = 0;  // of the slot in the reduced matrix
    double coefficient = 0.0;
  };
  struct Plan {
    bool selection = true;
    int begin = 0;  // into slots_ (selection) or general_ (otherwise)
    int end = 0;
    int columns = 0;  // into columns_ (selection): the reduced column of each local column
  };
  std::vector<std::vector<int>> blocks_;
  std::vector<Plan> plans_;
  std::vector<int> slots_;  // n*n per selection block, -1 where a variable is eliminated
  std::vector<int> columns_;  // n per selection block, -1 where a variable is eliminated
  std::vector<GeneralEntry> general_;
  SparseMatrix pattern_;
};

}  // namespace plystrain::solver
