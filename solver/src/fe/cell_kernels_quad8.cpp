// Instantiations of the cell kernels for 16, 17 unknowns (see cell_kernels.hpp).
#include "cell_kernels.hpp"

namespace plystrain::solver::cell_kernels {

template KernelOutcome sized_cell<16>(const CellSetting&, const CellCoordinates&, const CellVector&, CellVector*,
                                         CellMatrix*, std::span<PointState>);
template KernelOutcome sized_cell<17>(const CellSetting&, const CellCoordinates&, const CellVector&, CellVector*,
                                         CellMatrix*, std::span<PointState>);

}  // namespace plystrain::solver::cell_kernels
