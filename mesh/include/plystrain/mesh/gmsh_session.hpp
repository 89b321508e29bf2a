// The one owner of Gmsh's process-wide state. Gmsh keeps a single global
// model, so only one session may exist at a time; constructing a second one
// while the first is alive throws MeshError.
//
// The session initialises Gmsh quietly (no option files, no terminal output,
// one meshing thread so that meshes are reproducible), restores the OpenMP
// thread count that gmsh::initialize() resets, turns Gmsh's errors into
// MeshError (Gmsh logs them instead of throwing: a throw from inside one of
// its parallel loops would abort the process) and finalises Gmsh in its
// destructor.
//
// Geometry is built with Gmsh's built-in kernel in the (x, y) plane; the
// mesher maps its (x, z) to Gmsh's (x, y).
#pragma once

#include <array>
#include <cstddef>
#include <filesystem>
#include <string>
#include <vector>

namespace plystrain::mesh {

class GmshSession {
 public:
  GmshSession();
  ~GmshSession();
  GmshSession(const GmshSession&) = delete;
  GmshSession& operator=(const GmshSession&) = delete;
  GmshSession(GmshSession&&) = delete;
  GmshSession& operator=(GmshSession&&) = delete;

  // Starts a new, empty model (removing any previous one).
  void new_model(const std::string& name);

  // --- geometry (built-in kernel) ---
  int add_point(double x, double y);
  int add_line(int start_point, int end_point);
  // A plane surface bounded by one closed loop of signed curve tags
  // (negative = curve walked against its orientation).
  int add_plane_surface(const std::vector<int>& signed_curves);
  // `nodes` nodes on the curve; element lengths in geometric progression of
  // ratio `progression` along the curve's own orientation.
  void set_transfinite_curve(int curve, int nodes, double progression);
  // A structured, recombined (quadrilateral) patch with the given corners.
  void set_structured_quad_patch(int surface, const std::array<int, 4>& corners);
  void add_physical_group(int dim, const std::vector<int>& tags, const std::string& name);

  // Synchronises the geometry, meshes in 2D and raises the order (1 or 2;
  // order 2 gives complete 9-node quads and 6-node triangles).
  void generate(int order);

  // --- reading the mesh back ---
  struct Nodes {
    std::vector<std::size_t> tags;
    std::vector<double> xyz;  // 3 per node
  };
  struct Elements {
    int gmsh_type = 0;  // Gmsh element type number (1, 8: lines; 2, 9: triangles; 3, 10, 16: quads)
    int nodes_per_element = 0;
    std::vector<std::size_t> node_tags;  // nodes_per_element per element
  };
  [[nodiscard]] Nodes all_nodes() const;
  [[nodiscard]] std::vector<Elements> elements_of(int dim, int tag) const;

  // Writes the current model and mesh with Gmsh's own writer; the format
  // follows the file extension (.msh: Gmsh format 4.1).
  void write(const std::filesystem::path& path) const;

 private:
  int saved_omp_threads_ = 1;
};

}  // namespace plystrain::mesh
