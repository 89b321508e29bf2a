#include "plystrain/mesh/gmsh_session.hpp"

#include "plystrain/mesh/mesh_error.hpp"

#include <gmsh.h>
#include <omp.h>

#include <atomic>
#include <exception>
#include <string>
#include <type_traits>
#include <utility>
#include <vector>

namespace plystrain::mesh {

namespace {

// Gmsh's model is process-wide; this flag only guards that no two sessions
// use it at once.
std::atomic<bool>& session_alive() {
  static std::atomic<bool> alive{false};
  return alive;
}

// Gmsh 4.8 throws std::string (and sometimes const char*) on errors.
template <class Call>
auto translated(const char* what, Call&& call) -> decltype(call()) {
  try {
    return std::forward<Call>(call)();
  } catch (const std::string& message) {
    throw MeshError(std::string("Gmsh failed in ") + what + ": " + message);
  } catch (const char* message) {
    throw MeshError(std::string("Gmsh failed in ") + what + ": " + message);
  } catch (const MeshError&) {
    throw;
  } catch (const std::exception& error) {
    throw MeshError(std::string("Gmsh failed in ") + what + ": " + error.what());
  }
}

// Gmsh's errors are logged, not thrown (General.AbortOnError = 0): thrown,
// an error raised inside one of Gmsh's own OpenMP loops (a transfinite
// surface it cannot mesh) leaves the parallel region and aborts the process.
// The log of each call is read afterwards and its first error becomes a
// MeshError.
class LoggedErrors {
 public:
  LoggedErrors() { gmsh::logger::start(); }
  ~LoggedErrors() {
    try {
      gmsh::logger::stop();
    } catch (...) {
      // Stopping the log only fails when Gmsh is gone; nothing to undo then.
    }
  }
  LoggedErrors(const LoggedErrors&) = delete;
  LoggedErrors& operator=(const LoggedErrors&) = delete;

  void throw_first(const char* what) const {
    std::vector<std::string> log;
    gmsh::logger::get(log);
    const std::string prefix = "Error: ";
    for (const std::string& line : log) {
      if (line.rfind("Error", 0) == 0) {
        const std::string message = line.rfind(prefix, 0) == 0 ? line.substr(prefix.size()) : line;
        throw MeshError(std::string("Gmsh failed in ") + what + ": " + message);
      }
    }
  }
};

template <class Call>
auto guarded(const char* what, Call&& call) -> decltype(call()) {
  const LoggedErrors errors;
  if constexpr (std::is_void_v<decltype(call())>) {
    translated(what, std::forward<Call>(call));
    errors.throw_first(what);
  } else {
    auto result = translated(what, std::forward<Call>(call));
    errors.throw_first(what);
    return result;
  }
}

}  // namespace

GmshSession::GmshSession() {
  bool expected = false;
  if (!session_alive().compare_exchange_strong(expected, true)) {
    throw MeshError("a Gmsh session is already open; Gmsh allows one at a time");
  }
  saved_omp_threads_ = omp_get_max_threads();
  try {
    translated("initialize", [] {
      gmsh::initialize(0, nullptr, false);
      gmsh::option::setNumber("General.AbortOnError", 0);
      gmsh::option::setNumber("General.Terminal", 0);
      // Errors only: they reach the log that guarded() reads.
      gmsh::option::setNumber("General.Verbosity", 1);
    });
    guarded("setting options", [] {
      // Several 2D meshing threads made different meshes from run to run.
      gmsh::option::setNumber("General.NumThreads", 1);
      gmsh::option::setNumber("Mesh.MaxNumThreads1D", 1);
      gmsh::option::setNumber("Mesh.MaxNumThreads2D", 1);
      // Coincident points of a delamination must stay separate entities.
      gmsh::option::setNumber("Geometry.AutoCoherence", 0);
      gmsh::option::setNumber("Mesh.SecondOrderIncomplete", 0);
      gmsh::option::setNumber("Mesh.SecondOrderLinear", 1);
      gmsh::option::setNumber("Mesh.MshFileVersion", 4.1);
      gmsh::option::setNumber("Mesh.Binary", 0);
    });
    // Both initialize() and General.NumThreads reset the process-wide count.
    omp_set_num_threads(saved_omp_threads_);
  } catch (...) {
    omp_set_num_threads(saved_omp_threads_);
    session_alive().store(false);
    throw;
  }
}

GmshSession::~GmshSession() {
  try {
    gmsh::finalize();
  } catch (...) {
    // Nothing useful can be done about a failing finalize in a destructor.
  }
  omp_set_num_threads(saved_omp_threads_);
  session_alive().store(false);
}

void GmshSession::new_model(const std::string& name) {
  guarded("clearing the model", [&] {
    gmsh::clear();
    gmsh::model::add(name);
  });
}

int GmshSession::add_point(double x, double y) {
  return guarded("addPoint", [&] { return gmsh::model::geo::addPoint(x, y, 0.0); });
}

int GmshSession::add_line(int start_point, int end_point) {
  return guarded("addLine", [&] { return gmsh::model::geo::addLine(start_point, end_point); });
}

int GmshSession::add_plane_surface(const std::vector<int>& signed_curves) {
  return guarded("addPlaneSurface", [&] {
    const int loop = gmsh::model::geo::addCurveLoop(signed_curves);
    return gmsh::model::geo::addPlaneSurface({loop});
  });
}

void GmshSession::set_transfinite_curve(int curve, int nodes, double progression) {
  guarded("setTransfiniteCurve", [&] {
    gmsh::model::geo::mesh::setTransfiniteCurve(curve, nodes, "Progression", progression);
  });
}

void GmshSession::set_structured_quad_patch(int surface, const std::array<int, 4>& corners) {
  guarded("setTransfiniteSurface", [&] {
    gmsh::model::geo::mesh::setTransfiniteSurface(surface, "Left",
                                                  std::vector<int>(corners.begin(), corners.end()));
    gmsh::model::geo::mesh::setRecombine(2, surface);
  });
}

void GmshSession::add_physical_group(int dim, const std::vector<int>& tags,
                                     const std::string& name) {
  guarded("addPhysicalGroup", [&] {
    gmsh::model::geo::synchronize();
    const int group = gmsh::model::addPhysicalGroup(dim, tags);
    gmsh::model::setPhysicalName(dim, group, name);
  });
}

void GmshSession::generate(int order) {
  guarded("meshing", [&] {
    gmsh::model::geo::synchronize();
    gmsh::model::mesh::generate(2);
    if (order > 1) {
      gmsh::model::mesh::setOrder(order);
    }
  });
  omp_set_num_threads(saved_omp_threads_);
}

GmshSession::Nodes GmshSession::all_nodes() const {
  return guarded("getNodes", [] {
    Nodes nodes;
    std::vector<double> parametric;
    gmsh::model::mesh::getNodes(nodes.tags, nodes.xyz, parametric, -1, -1, false, false);
    return nodes;
  });
}

std::vector<GmshSession::Elements> GmshSession::elements_of(int dim, int tag) const {
  return guarded("getElements", [&] {
    std::vector<int> types;
    std::vector<std::vector<std::size_t>> element_tags;
    std::vector<std::vector<std::size_t>> node_tags;
    gmsh::model::mesh::getElements(types, element_tags, node_tags, dim, tag);
    std::vector<Elements> blocks;
    for (std::size_t b = 0; b < types.size(); ++b) {
      Elements block;
      block.gmsh_type = types[b];
      const std::size_t count = element_tags[b].size();
      block.nodes_per_element = count == 0 ? 0 : static_cast<int>(node_tags[b].size() / count);
      block.node_tags = std::move(node_tags[b]);
      blocks.push_back(std::move(block));
    }
    return blocks;
  });
}

void GmshSession::write(const std::filesystem::path& path) const {
  guarded("write", [&] { gmsh::write(path.string()); });
}

}  // namespace plystrain::mesh
