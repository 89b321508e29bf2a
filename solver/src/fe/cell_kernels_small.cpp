// Instantiations of the cell kernels for 6, 7, 8, 9, 12, 13 unknowns (see cell_kernels.hpp).
#include "cell_kernels.hpp"

namespace plystrain::solver::cell_kernels {

template KernelOutcome sized_cell<6>(const CellSetting&, const CellCoordinates&, const CellVector&, CellVector*,
                                         CellMatrix*, std::span<PointState>);
template KernelOutcome sized_cell<7>(const CellSetting&, const CellCoordinates&, const CellVector&, CellVector*,
                                         CellMatrix*, std::span<PointState>);
template KernelOutcome sized_cell<8>(const CellSetting&, const CellCoordinates&, const CellVector&, CellVector*,
                                         CellMatrix*, std::span<PointState>);
template KernelOutcome sized_cell<9>(const CellSetting&, const CellCoordinates&, const CellVector&, CellVector*,
                                         CellMatrix*, std::span<PointState>);
template KernelOutcome sized_cell<12>(const CellSetting&, const CellCoordinates&, const CellVector&, CellVector*,
                                         CellMatrix*, std::span<PointState>);
template KernelOutcome sized_cell<13>(const CellSetting&, const CellCoordinates&, const CellVector&, CellVector*,
                                         CellMatrix*, std::span<PointState>);

}  // namespace plystrain::solver::cell_kernels
