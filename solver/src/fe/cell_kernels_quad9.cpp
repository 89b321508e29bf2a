// Instantiations of the cell kernels for 18, 19 unknowns (see cell_kernels.hpp).
#include "cell_kernels.hpp"

namespace plystrain::solver::cell_kernels {

template KernelOutcome sized_cell<18>(const CellSetting&, const CellCoordinates&, const CellVector&, CellVector*,
                                         CellMatrix*, std::span<PointState>);
template KernelOutcome sized_cell<19>(const CellSetting&, const CellCoordinates&, const CellVector&, CellVector*,
                                         CellMatrix*, std::span<PointState>);

}  // namespace plystrain::solver::cell_kernels
