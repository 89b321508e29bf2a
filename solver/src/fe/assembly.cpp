#include "plystrain/solver/assembly.hpp"

#include <algorithm>
#include <cstring>
#include <stdexcept>

namespace plystrain::solver {
namespace {

bool is_selection_block(const ConstraintSet& constraints, const std::vector<int>& variables) {
  for (const int v : variables) {
    const std::span<const AffineTerm> row = constraints.reduced_row(v);
    if (row.size() > 1 || (row.size() == 1 && row[0].coefficient != 1.0)) {
      return false;
    }
  }
  return true;
}

}  // namespace

AssemblyPattern::AssemblyPattern(const ConstraintSet& constraints,
                                 const std::vector<std::vector<int>>& blocks)
    : blocks_(blocks) {
  const int n = constraints.reduced_count();
  // Column lists of row indices, then sorted and unique.
  std::vector<std::vector<int>> columns(static_cast<std::size_t>(n));
  for (const std::vector<int>& block : blocks_) {
    for (const int vb : block) {
      for (const AffineTerm& tb : constraints.reduced_row(vb)) {
        std::vector<int>& column = columns[static_cast<std::size_t>(tb.index)];
        for (const int va : block) {
          for (const AffineTerm& ta : constraints.reduced_row(va)) {
            column.push_back(ta.index);
          }
        }
      }
    }
  }
  std::vector<int> outer(static_cast<std::size_t>(n) + 1, 0);
  for (int j = 0; j < n; ++j) {
    std::vector<int>& column = columns[static_cast<std::size_t>(j)];
    std::sort(column.begin(), column.end());
    column.erase(std::unique(column.begin(), column.end()), column.end());
    column.shrink_to_fit();
    outer[static_cast<std::size_t>(j) + 1] = outer[static_cast<std::size_t>(j)] + static_cast<int>(column.size());
  }
  const int nnz = outer.back();
  pattern_.resize(n, n);
  pattern_.resizeNonZeros(nnz);
  std::copy(outer.begin(), outer.end(), pattern_.outerIndexPtr());
  for (int j = 0; j < n; ++j) {
    const std::vector<int>& column = columns[static_cast<std::size_t>(j)];
    std::copy(column.begin(), column.end(), pattern_.innerIndexPtr() + outer[static_cast<std::size_t>(j)]);
  }
  std::fill(pattern_.valuePtr(), pattern_.valuePtr() + nnz, 0.0);
  columns.clear();

  auto slot_of = [this](int row, int col) {
    const int* begin = pattern_.innerIndexPtr() + pattern_.outerIndexPtr()[col];
    const int* end = pattern_.innerIndexPtr() + pattern_.outerIndexPtr()[col + 1];
    const int* found = std::lower_bound(begin, end, row);
    return static_cast<int>(found - pattern_.innerIndexPtr());
  };

  plans_.reserve(blocks_.size());
  for (const std::vector<int>& block : blocks_) {
    Plan plan;
    plan.selection = is_selection_block(constraints, block);
    const int m = static_cast<int>(block.size());
    if (plan.selection) {
      plan.begin = static_cast<int>(slots_.size());
      plan.columns = static_cast<int>(columns_.size());
      for (int b = 0; b < m; ++b) {
        const std::span<const AffineTerm> rb = constraints.reduced_row(block[static_cast<std::size_t>(b)]);
        columns_.push_back(rb.empty() ? -1 : rb[0].index);
        for (int a = 0; a < m; ++a) {
          const std::span<const AffineTerm> ra = constraints.reduced_row(block[static_cast<std::size_t>(a)]);
          slots_.push_back(ra.empty() || rb.empty() ? -1 : slot_of(ra[0].index, rb[0].index));
        }
      }
      plan.end = static_cast<int>(slots_.size());
    } else {
      plan.begin = static_cast<int>(general_.size());
      for (int b = 0; b < m; ++b) {
        for (const AffineTerm& tb : constraints.reduced_row(block[static_cast<std::size_t>(b)])) {
          for (int a = 0; a < m; ++a) {
            for (const AffineTerm& ta : constraints.reduced_row(block[static_cast<std::size_t>(a)])) {
              general_.push_back({a + m * b, slot_of(ta.index, tb.index), tb.index, ta.coefficient * tb.coefficient});
            }
          }
        }
      }
      plan.end = static_cast<int>(general_.size());
    }
    plans_.push_back(plan);
  }
}

void AssemblyPattern::adopt_pattern(SparseMatrix& matrix) const {
  const bool same =
      matrix.rows() == pattern_.rows() && matrix.cols() == pattern_.cols() &&
      matrix.isCompressed() && matrix.nonZeros() == pattern_.nonZeros() &&
      std::equal(pattern_.outerIndexPtr(), pattern_.outerIndexPtr() + pattern_.cols() + 1,
                 matrix.outerIndexPtr()) &&
      std::equal(pattern_.innerIndexPtr(), pattern_.innerIndexPtr() + pattern_.nonZeros(),
                 matrix.innerIndexPtr());
  if (!same) {
    matrix = pattern_;
  }
}

void AssemblyPattern::scatter_matrix(int block, const double* k, int n, double* values,
                                     ScatterShare share) const {
  const Plan& plan = plans_[static_cast<std::size_t>(block)];
  if (plan.selection) {
    const int* slot = slots_.data() + plan.begin;
    const int* column = columns_.data() + plan.columns;
    for (int b = 0; b < n; ++b) {
      if (column[b] < 0 || !share.owns(column[b])) {
        continue;
      }
      const int* slot_b = slot + n * b;
      const double* k_b = k + n * b;
      for (int a = 0; a < n; ++a) {
        if (slot_b[a] >= 0) {
          values[slot_b[a]] += k_b[a];
        }
      }
    }
    return;
  }
  for (int i = plan.begin; i < plan.end; ++i) {
    const GeneralEntry& e = general_[static_cast<std::size_t>(i)];
    if (share.owns(e.column)) {
      values[e.slot] += e.coefficient * k[e.local];
    }
  }
}

void AssemblyPattern::scatter_vector(int block, const double* r, int n, Eigen::VectorXd& variables,
                                     ScatterShare share) const {
  const std::vector<int>& vars = blocks_[static_cast<std::size_t>(block)];
  for (int a = 0; a < n; ++a) {
    const int v = vars[static_cast<std::size_t>(a)];
    if (share.owns(v)) {
      variables(v) += r[a];
    }
  }
}

std::span<const int> AssemblyPattern::block_variables(int block) const {
  return blocks_[static_cast<std::size_t>(block)];
}

std::size_t AssemblyPattern::slot_count() const { return slots_.size() + columns_.size() + general_.size(); }

}  // namespace plystrain::solver
