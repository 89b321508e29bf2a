#include "plystrain/solver/elements.hpp"

namespace plystrain::solver {
namespace {

// 1D quadratic Lagrange polynomials on the nodes -1, +1, 0 (in that order).
void quadratic_1d(double s, double (&value)[3], double (&derivative)[3]) {
  value[0] = 0.5 * s * (s - 1.0);
  value[1] = 0.5 * s * (s + 1.0);
  value[2] = 1.0 - s * s;
  derivative[0] = s - 0.5;
  derivative[1] = s + 0.5;
  derivative[2] = -2.0 * s;
}

}  // namespace

void shape_functions(mesh::CellType type, const Eigen::Vector2d& xi, ShapeValues& N,
                     ShapeGradients& dN) {
  const double x = xi.x();
  const double y = xi.y();
  const int n = mesh::node_count(type);
  N.resize(n);
  dN.resize(n, 2);
  switch (type) {
    case mesh::CellType::tri3:
      N << 1.0 - x - y, x, y;
      dN << -1.0, -1.0, 1.0, 0.0, 0.0, 1.0;
      return;
    case mesh::CellType::tri6: {
      const double l0 = 1.0 - x - y;
      N << l0 * (2.0 * l0 - 1.0), x * (2.0 * x - 1.0), y * (2.0 * y - 1.0), 4.0 * l0 * x,
          4.0 * x * y, 4.0 * y * l0;
      dN << -(4.0 * l0 - 1.0), -(4.0 * l0 - 1.0),  //
          4.0 * x - 1.0, 0.0,                      //
          0.0, 4.0 * y - 1.0,                      //
          4.0 * (l0 - x), -4.0 * x,                //
          4.0 * y, 4.0 * x,                        //
          -4.0 * y, 4.0 * (l0 - y);
      return;
    }
    case mesh::CellType::quad4: {
      constexpr double cx[4] = {-1, 1, 1, -1};
      constexpr double cy[4] = {-1, -1, 1, 1};
      for (int a = 0; a < 4; ++a) {
        N(a) = 0.25 * (1 + cx[a] * x) * (1 + cy[a] * y);
        dN(a, 0) = 0.25 * cx[a] * (1 + cy[a] * y);
        dN(a, 1) = 0.25 * cy[a] * (1 + cx[a] * x);
      }
      return;
    }
    case mesh::CellType::quad8: {
      constexpr double cx[4] = {-1, 1, 1, -1};
      constexpr double cy[4] = {-1, -1, 1, 1};
      for (int a = 0; a < 4; ++a) {
        const double px = 1 + cx[a] * x;
        const double py = 1 + cy[a] * y;
        const double s = cx[a] * x + cy[a] * y - 1;
        N(a) = 0.25 * px * py * s;
        dN(a, 0) = 0.25 * cx[a] * py * (s + px);
        dN(a, 1) = 0.25 * cy[a] * px * (s + py);
      }
      // Mid-nodes 4 (0,-1), 5 (1,0), 6 (0,1), 7 (-1,0).
      N(4) = 0.5 * (1 - x * x) * (1 - y);
      dN(4, 0) = -x * (1 - y);
      dN(4, 1) = -0.5 * (1 - x * x);
      N(5) = 0.5 * (1 + x) * (1 - y * y);
      dN(5, 0) = 0.5 * (1 - y * y);
      dN(5, 1) = -y * (1 + x);
      N(6) = 0.5 * (1 - x * x) * (1 + y);
      dN(6, 0) = -x * (1 + y);
      dN(6, 1) = 0.5 * (1 - x * x);
      N(7) = 0.5 * (1 - x) * (1 - y * y);
      dN(7, 0) = -0.5 * (1 - y * y);
      dN(7, 1) = -y * (1 - x);
      return;
    }
    case mesh::CellType::quad9: {
      double vx[3], dx[3], vy[3], dy[3];
      quadratic_1d(x, vx, dx);
      quadratic_1d(y, vy, dy);
      // Index into the 1D functions (0: -1, 1: +1, 2: 0) per node.
      constexpr int ix[9] = {0, 1, 1, 0, 2, 1, 2, 0, 2};
      constexpr int iy[9] = {0, 0, 1, 1, 0, 2, 1, 2, 2};
      for (int a = 0; a < 9; ++a) {
        N(a) = vx[ix[a]] * vy[iy[a]];
        dN(a, 0) = dx[ix[a]] * vy[iy[a]];
        dN(a, 1) = vx[ix[a]] * dy[iy[a]];
      }
      return;
    }
  }
}

void line_shape_functions(int node_count, double s, Eigen::Vector3d& N, Eigen::Vector3d& dN) {
  if (node_count == 3) {
    N << 0.5 * s * (s - 1.0), 0.5 * s * (s + 1.0), 1.0 - s * s;
    dN << s - 0.5, s + 0.5, -2.0 * s;
  } else {
    N << 0.5 * (1.0 - s), 0.5 * (1.0 + s), 0.0;
    dN << -0.5, 0.5, 0.0;
  }
}

int pressure_function_count(mesh::CellType type) {
  switch (type) {
    case mesh::CellType::tri3: return 0;
    case mesh::CellType::tri6: return 1;
    case mesh::CellType::quad4: return 1;
    case mesh::CellType::quad8:
    case mesh::CellType::quad9: return 3;
  }
  return 0;
}

}  // namespace plystrain::solver
