#include "plystrain/mesh/stack_mesher.hpp"

#include "plystrain/mesh/gmsh_session.hpp"
#include "plystrain/mesh/mesh_error.hpp"
#include "plystrain/mesh/quality.hpp"
#include "stack_layout.hpp"

#include <algorithm>
#include <cmath>
#include <map>
#include <set>
#include <sstream>
#include <tuple>
#include <unordered_map>

namespace plystrain::mesh {

namespace {

using detail::Band;
using detail::Column;
using detail::Layout;

// A geometric point on a column boundary. Two points may share coordinates:
// the lower and the upper face of a delamination.
struct LinePoint {
  double z = 0.0;
  bool upper_face = false;
  int tag = 0;
};

// Where a piece of the boundary belongs: an edge set, the curve and the
// surface whose cells carry it.
struct SetPiece {
  std::string set;
  int curve = 0;
  int surface = 0;
};

struct Patch {
  int layer = 0;
  int column = 0;
  int surface = 0;
};

class StackGeometry {
 public:
  StackGeometry(GmshSession& session, const StackDescription& stack, const Layout& layout)
      : session_(session), stack_(stack), layout_(layout) {
    double height = 0.0;
    for (const StackLayer& layer : stack.layers) {
      height += layer.thickness;
    }
    z_tolerance_ = 1e-9 * height;
    points_.resize(layout.lines.size());
  }

  void build() {
    mark_delaminations();
    create_corner_points();
    create_patches();
    assign_vertical_counts();
    for (const auto& [curve, count] : vertical_counts_) {
      session_.set_transfinite_curve(curve, count + 1, 1.0);
    }
    for (const auto& [curve, column] : horizontal_curves_) {
      const Column& c = layout_.columns[static_cast<std::size_t>(column)];
      session_.set_transfinite_curve(curve, c.elements + 1, c.progression);
    }
    for (const PendingPatch& pending : pending_) {
      const int surface = session_.add_plane_surface(pending.loop);
      session_.set_structured_quad_patch(surface, pending.corners);
      patches_.push_back({pending.layer, pending.column, surface});
      for (SetPiece piece : pending.pieces) {
        piece.surface = surface;
        pieces_.push_back(piece);
      }
    }
    // Pieces that belong to the patch below an interface (the lower side)
    // were recorded with the patch index; resolve them now.
    for (const auto& [piece, patch_index] : lower_side_pieces_) {
      SetPiece resolved = piece;
      resolved.surface = patches_[static_cast<std::size_t>(patch_index)].surface;
      pieces_.push_back(resolved);
    }
  }

  [[nodiscard]] const std::vector<Patch>& patches() const { return patches_; }
  [[nodiscard]] const std::vector<SetPiece>& pieces() const { return pieces_; }
  [[nodiscard]] const std::vector<std::string>& pair_names() const { return pair_names_; }

 private:
  struct PendingPatch {
    int layer = 0;
    int column = 0;
    std::vector<int> loop;
    std::array<int, 4> corners{};
    std::vector<SetPiece> pieces;  // surface filled in when created
    std::vector<int> left_side;    // vertical curves, bottom to top
    std::vector<int> right_side;
    // Per sub-band (see Band::levels): its curves on each side.
    std::vector<std::vector<int>> left_parts;
    std::vector<std::vector<int>> right_parts;
  };

  // The vertical curves of one side of a band, per sub-band.
  std::vector<std::vector<int>> band_side(int column, int layer, int end, int bottom_point,
                                          int top_point) {
    const Band& b = band(column, layer);
    const auto e = static_cast<std::size_t>(end);
    const int line = column + end;
    std::vector<std::pair<int, double>> stops{{bottom_point, b.bottom[e]}};
    for (const std::array<double, 2>& level : b.levels) {
      stops.emplace_back(point(line, level[e], false), level[e]);
    }
    stops.emplace_back(top_point, b.top[e]);
    std::vector<std::vector<int>> parts;
    for (std::size_t k = 0; k + 1 < stops.size(); ++k) {
      parts.push_back(vertical_side(line, stops[k].first, stops[k].second, stops[k + 1].first,
                                    stops[k + 1].second));
    }
    return parts;
  }

  [[nodiscard]] const Band& band(int column, int layer) const {
    return layout_.bands[static_cast<std::size_t>(column)][static_cast<std::size_t>(layer)];
  }
  [[nodiscard]] int column_count() const { return static_cast<int>(layout_.columns.size()); }
  [[nodiscard]] int layer_count() const { return static_cast<int>(stack_.layers.size()); }

  // The present layer resting directly on the top face of `layer` in a
  // column, or -1.
  [[nodiscard]] int layer_resting_on(int column, int layer) const {
    for (int m = layer + 1; m < layer_count(); ++m) {
      if (band(column, m).present) {
        return band(column, m).rests_on == layer ? m : -1;
      }
    }
    return -1;
  }

  void mark_delaminations() {
    delaminated_.assign(layout_.columns.size(), std::vector<int>(stack_.layers.size(), -1));
    const double x_tolerance = 1e-9 * (stack_.width - detail::domain_start(stack_));
    for (std::size_t d = 0; d < stack_.defects.size(); ++d) {
      const StackDefect& defect = stack_.defects[d];
      if (defect.kind != DefectKind::delamination) {
        continue;
      }
      pair_names_.push_back(delamination_name(defect));
      const detail::DefectExtent extent = detail::extent_of(defect);
      for (int c = 0; c < column_count(); ++c) {
        const Column& column = layout_.columns[static_cast<std::size_t>(c)];
        if (column.x0 < extent.lo - x_tolerance || column.x1 > extent.hi + x_tolerance) {
          continue;
        }
        if (!band(c, defect.layer).present || layer_resting_on(c, defect.layer) < 0) {
          continue;
        }
        delaminated_[static_cast<std::size_t>(c)][static_cast<std::size_t>(defect.layer)] =
            static_cast<int>(d);
      }
      // Lines strictly inside the span (and the symmetry plane or axis when
      // the span is centred on it) get separate points for the two faces.
      // A span that reaches the outer edge opens there too: no tip.
      const std::size_t last = layout_.lines.size() - 1;
      for (std::size_t i = 0; i <= last; ++i) {
        const double x = layout_.lines[i];
        const bool inside = (x > extent.lo + x_tolerance && x < extent.hi - x_tolerance) ||
                            (i == 0 && extent.lo <= x + x_tolerance) ||
                            (i == last && extent.hi >= x - x_tolerance);
        if (inside) {
          split_lines_.push_back({static_cast<int>(i), defect.layer});
        }
      }
    }
  }

  // True if the top face of `layer` at line `line` separates into two faces.
  [[nodiscard]] bool is_split(int line, int layer, double z) const {
    const bool listed = std::any_of(split_lines_.begin(), split_lines_.end(), [&](const auto& s) {
      return s.first == line && s.second == layer;
    });
    if (!listed) {
      return false;
    }
    // A point strictly inside the side of any band at this line stays one
    // point: the side is bonded there (a pinhole rim, a step wall).
    for (const int c : {line - 1, line}) {
      if (c < 0 || c >= column_count()) {
        continue;
      }
      const int end = c == line ? 0 : 1;
      for (int m = 0; m < layer_count(); ++m) {
        const Band& b = band(c, m);
        if (b.present && b.bottom[static_cast<std::size_t>(end)] < z - z_tolerance_ &&
            z < b.top[static_cast<std::size_t>(end)] - z_tolerance_) {
          return false;
        }
      }
    }
    return true;
  }

  int point(int line, double z, bool upper_face) {
    std::vector<LinePoint>& on_line = points_[static_cast<std::size_t>(line)];
    for (const LinePoint& p : on_line) {
      if (std::abs(p.z - z) <= z_tolerance_ && p.upper_face == upper_face) {
        return p.tag;
      }
    }
    const int tag = session_.add_point(layout_.lines[static_cast<std::size_t>(line)], z);
    on_line.push_back({z, upper_face, tag});
    return tag;
  }

  // The corner of a band's bottom face: the upper-face copy if the band
  // rests on a delaminated face and the point is split there.
  int bottom_corner(int column, int layer, int end) {
    const Band& b = band(column, layer);
    const int line = column + end;
    const double z = b.bottom[static_cast<std::size_t>(end)];
    bool upper = false;
    if (b.rests_on >= 0 &&
        delaminated_[static_cast<std::size_t>(column)][static_cast<std::size_t>(b.rests_on)] >= 0) {
      upper = is_split(line, b.rests_on, z);
    }
    return point(line, z, upper);
  }

  int top_corner(int column, int layer, int end) {
    const Band& b = band(column, layer);
    return point(column + end, b.top[static_cast<std::size_t>(end)], false);
  }

  void create_corner_points() {
    for (int c = 0; c < column_count(); ++c) {
      for (int l = 0; l < layer_count(); ++l) {
        if (!band(c, l).present) {
          continue;
        }
        for (const int end : {0, 1}) {
          bottom_corner(c, l, end);
          top_corner(c, l, end);
          for (const std::array<double, 2>& level : band(c, l).levels) {
            point(c + end, level[static_cast<std::size_t>(end)], false);
          }
        }
      }
    }
    for (std::vector<LinePoint>& on_line : points_) {
      std::sort(on_line.begin(), on_line.end(),
                [](const LinePoint& a, const LinePoint& b) { return a.z < b.z; });
    }
  }

  // Vertical curves from `from` up to `to` on a line, through every
  // ordinary point strictly between them.
  std::vector<int> vertical_side(int line, int from, double z_from, int to, double z_to) {
    std::vector<int> chain{from};
    for (const LinePoint& p : points_[static_cast<std::size_t>(line)]) {
      if (!p.upper_face && p.z > z_from + z_tolerance_ && p.z < z_to - z_tolerance_) {
        chain.push_back(p.tag);
      }
    }
    chain.push_back(to);
    std::vector<int> curves;
    for (std::size_t k = 0; k + 1 < chain.size(); ++k) {
      const auto key = std::make_pair(chain[k], chain[k + 1]);
      auto found = vertical_curves_.find(key);
      if (found == vertical_curves_.end()) {
        found = vertical_curves_.emplace(key, session_.add_line(chain[k], chain[k + 1])).first;
      }
      curves.push_back(found->second);
    }
    return curves;
  }

  // A horizontal curve from the left point to the right one; `face` keeps
  // the two faces of a delamination apart when their end points coincide.
  // Returns the signed tag walked from left to right.
  int horizontal(int column, int left, int right, int face) {
    const auto key = std::make_tuple(left, right, face);
    auto found = horizontal_keys_.find(key);
    if (found == horizontal_keys_.end()) {
      const Column& c = layout_.columns[static_cast<std::size_t>(column)];
      // Gmsh's progression follows the curve: start the curve at the fine end.
      const int tag = c.fine_at_left ? session_.add_line(left, right)
                                     : -session_.add_line(right, left);
      horizontal_curves_.emplace_back(std::abs(tag), column);
      found = horizontal_keys_.emplace(key, tag).first;
    }
    return found->second;
  }

  void create_patches() {
    const bool full_strip = stack_.shape == StackShape::strip && !stack_.symmetric;
    const std::string start_set =
        full_strip ? "outer-left" : (stack_.shape == StackShape::disk ? "axis" : "symmetry");
    const int last_line = column_count();
    std::map<std::pair<int, int>, int> patch_index;  // (column, layer) -> pending index
    for (int c = 0; c < column_count(); ++c) {
      for (int l = 0; l < layer_count(); ++l) {
        const Band& b = band(c, l);
        if (!b.present) {
          continue;
        }
        PendingPatch patch;
        patch.layer = l;
        patch.column = c;
        const int bl = bottom_corner(c, l, 0);
        const int br = bottom_corner(c, l, 1);
        const int tl = top_corner(c, l, 0);
        const int tr = top_corner(c, l, 1);
        const bool on_open_face =
            b.rests_on >= 0 &&
            delaminated_[static_cast<std::size_t>(c)][static_cast<std::size_t>(b.rests_on)] >= 0;
        const int bottom = horizontal(c, bl, br, on_open_face ? 1 : 0);
        const int top = horizontal(c, tl, tr, 0);
        patch.right_parts = band_side(c, l, 1, br, tr);
        patch.left_parts = band_side(c, l, 0, bl, tl);
        for (const std::vector<int>& part : patch.right_parts) {
          patch.right_side.insert(patch.right_side.end(), part.begin(), part.end());
        }
        for (const std::vector<int>& part : patch.left_parts) {
          patch.left_side.insert(patch.left_side.end(), part.begin(), part.end());
        }
        patch.loop.push_back(bottom);
        patch.loop.insert(patch.loop.end(), patch.right_side.begin(), patch.right_side.end());
        patch.loop.push_back(-top);
        for (auto it = patch.left_side.rbegin(); it != patch.left_side.rend(); ++it) {
          patch.loop.push_back(-*it);
        }
        patch.corners = {bl, br, tr, tl};

        if (b.rests_on == detail::rests_on_ground) {
          patch.pieces.push_back({"bottom", std::abs(bottom), 0});
        } else if (b.rests_on >= 0) {
          const int below = patch_index.at({c, b.rests_on});
          const int delamination =
              delaminated_[static_cast<std::size_t>(c)][static_cast<std::size_t>(b.rests_on)];
          if (delamination >= 0) {
            const std::string name =
                delamination_name(stack_.defects[static_cast<std::size_t>(delamination)]);
            patch.pieces.push_back({name + "-upper", std::abs(bottom), 0});
            const int lower_face = horizontal(c, bottom_corner_lower(c, l, 0),
                                              bottom_corner_lower(c, l, 1), 0);
            lower_side_pieces_.emplace_back(SetPiece{name + "-lower", std::abs(lower_face), 0},
                                            below);
          } else {
            const std::string& name = stack_.layers[static_cast<std::size_t>(b.rests_on)].name;
            lower_side_pieces_.emplace_back(
                SetPiece{"interface-" + name, std::abs(bottom), 0}, below);
          }
        }
        if (l == layer_count() - 1) {
          patch.pieces.push_back({"top", std::abs(top), 0});
        }
        if (c == 0) {
          for (const int curve : patch.left_side) {
            patch.pieces.push_back({start_set, curve, 0});
          }
        }
        if (c + 1 == last_line) {
          for (const int curve : patch.right_side) {
            patch.pieces.push_back({"outer", curve, 0});
          }
        }
        patch_index[{c, l}] = static_cast<int>(pending_.size());
        pending_.push_back(std::move(patch));
      }
    }
  }

  // The ordinary (lower-face) corner at the bottom of a band.
  int bottom_corner_lower(int column, int layer, int end) {
    const Band& b = band(column, layer);
    return point(column + end, b.bottom[static_cast<std::size_t>(end)], false);
  }

  // Through-thickness element counts of the vertical curves: a curve that
  // is the whole side of a band takes the band's count; a curve that is only
  // part of a side (a step wall, a pinhole rim) takes what the side leaves.
  void assign_vertical_counts() {
    struct Side {
      std::vector<int> curves;
      int elements = 0;
      int layer = 0;
      int column = 0;
    };
    std::vector<Side> sides;
    for (const PendingPatch& patch : pending_) {
      const std::vector<int>& elements = band(patch.column, patch.layer).sub_elements;
      for (std::size_t k = 0; k < elements.size(); ++k) {
        sides.push_back({patch.left_parts[k], elements[k], patch.layer, patch.column});
        sides.push_back({patch.right_parts[k], elements[k], patch.layer, patch.column});
      }
    }
    const auto conflict = [&](const Side& side) {
      std::ostringstream message;
      message << "cannot build structured bands through layer '"
              << stack_.layers[static_cast<std::size_t>(side.layer)].name << "' near x = "
              << layout_.columns[static_cast<std::size_t>(side.column)].x0
              << ": the defects there do not line up; move them apart";
      return MeshError::for_layer(side.layer, message.str());
    };
    for (const Side& side : sides) {
      if (side.curves.size() != 1) {
        continue;
      }
      const auto [it, inserted] = vertical_counts_.emplace(side.curves[0], side.elements);
      if (!inserted && it->second != side.elements) {
        throw conflict(side);
      }
    }
    bool changed = true;
    while (changed) {
      changed = false;
      for (const Side& side : sides) {
        int known = 0;
        int unknown_curve = 0;
        int unknowns = 0;
        for (const int curve : side.curves) {
          const auto found = vertical_counts_.find(curve);
          if (found == vertical_counts_.end()) {
            ++unknowns;
            unknown_curve = curve;
          } else {
            known += found->second;
          }
        }
        if (unknowns == 1) {
          if (side.elements - known < 1) {
            throw conflict(side);
          }
          vertical_counts_[unknown_curve] = side.elements - known;
          changed = true;
        }
      }
    }
    for (const Side& side : sides) {
      int total = 0;
      for (const int curve : side.curves) {
        const auto found = vertical_counts_.find(curve);
        if (found == vertical_counts_.end()) {
          throw conflict(side);
        }
        total += found->second;
      }
      if (total != side.elements) {
        throw conflict(side);
      }
    }
  }

  GmshSession& session_;
  const StackDescription& stack_;
  const Layout& layout_;
  double z_tolerance_ = 0.0;
  std::vector<std::vector<LinePoint>> points_;
  std::vector<std::vector<int>> delaminated_;     // [column][layer] -> defect index or -1
  std::vector<std::pair<int, int>> split_lines_;  // (line, layer of the open face)
  std::map<std::pair<int, int>, int> vertical_curves_;
  std::map<std::tuple<int, int, int>, int> horizontal_keys_;
  std::vector<std::pair<int, int>> horizontal_curves_;  // (curve, column)
  std::map<int, int> vertical_counts_;
  std::vector<PendingPatch> pending_;
  std::vector<Patch> patches_;
  std::vector<SetPiece> pieces_;
  std::vector<std::pair<SetPiece, int>> lower_side_pieces_;
  std::vector<std::string> pair_names_;
};

CellType cell_type_of(int gmsh_type) {
  switch (gmsh_type) {
    case 2: return CellType::tri3;
    case 9: return CellType::tri6;
    case 3: return CellType::quad4;
    case 16: return CellType::quad8;
    case 10: return CellType::quad9;
    default: break;
  }
  throw MeshError("Gmsh made an element of unexpected type " + std::to_string(gmsh_type));
}

double corner_signed_area(const Mesh& mesh, const Cell& cell) {
  const int corners = corner_count(cell.type);
  double twice = 0.0;
  for (int i = 0; i < corners; ++i) {
    const Eigen::Vector2d& a = mesh.nodes[static_cast<std::size_t>(cell.nodes[static_cast<std::size_t>(i)])];
    const Eigen::Vector2d& b =
        mesh.nodes[static_cast<std::size_t>(cell.nodes[static_cast<std::size_t>((i + 1) % corners)])];
    twice += a.x() * b.y() - b.x() * a.y();
  }
  return 0.5 * twice;
}

// Reverses a cell's orientation while keeping Gmsh's node-order rules.
void reverse_orientation(Cell& cell) {
  std::array<int, max_nodes_per_cell> n = cell.nodes;
  const auto set = [&](std::initializer_list<int> order) {
    int k = 0;
    for (const int i : order) {
      cell.nodes[static_cast<std::size_t>(k++)] = n[static_cast<std::size_t>(i)];
    }
  };
  switch (cell.type) {
    case CellType::tri3: set({0, 2, 1}); break;
    case CellType::tri6: set({0, 2, 1, 5, 4, 3}); break;
    case CellType::quad4: set({0, 3, 2, 1}); break;
    case CellType::quad8: set({0, 3, 2, 1, 7, 6, 5, 4}); break;
    case CellType::quad9: set({0, 3, 2, 1, 7, 6, 5, 4, 8}); break;
  }
}

Mesh read_mesh(const GmshSession& session, const StackDescription& stack,
               const StackGeometry& geometry) {
  Mesh mesh;
  for (const StackLayer& layer : stack.layers) {
    mesh.region_names.push_back(layer.name);
  }
  GmshSession::Nodes nodes = session.all_nodes();
  std::vector<std::size_t> order(nodes.tags.size());
  for (std::size_t k = 0; k < order.size(); ++k) {
    order[k] = k;
  }
  std::sort(order.begin(), order.end(),
            [&](std::size_t a, std::size_t b) { return nodes.tags[a] < nodes.tags[b]; });
  std::unordered_map<std::size_t, int> index_of;
  mesh.nodes.reserve(order.size());
  for (const std::size_t k : order) {
    index_of.emplace(nodes.tags[k], static_cast<int>(mesh.nodes.size()));
    mesh.nodes.emplace_back(nodes.xyz[3 * k], nodes.xyz[3 * k + 1]);
  }
  const auto node = [&](std::size_t tag) {
    const auto found = index_of.find(tag);
    if (found == index_of.end()) {
      throw MeshError("Gmsh returned an element with an unknown node");
    }
    return found->second;
  };

  // Corner pair -> (cell, local edge), per surface, to attach boundary edges.
  std::map<int, std::map<std::pair<int, int>, std::pair<int, int>>> edges_of_surface;
  for (const Patch& patch : geometry.patches()) {
    auto& edge_map = edges_of_surface[patch.surface];
    for (const GmshSession::Elements& block : session.elements_of(2, patch.surface)) {
      const CellType type = cell_type_of(block.gmsh_type);
      const int per = block.nodes_per_element;
      for (std::size_t e = 0; e * static_cast<std::size_t>(per) < block.node_tags.size(); ++e) {
        Cell cell;
        cell.type = type;
        cell.region = patch.layer;
        for (int i = 0; i < per; ++i) {
          cell.nodes[static_cast<std::size_t>(i)] =
              node(block.node_tags[e * static_cast<std::size_t>(per) + static_cast<std::size_t>(i)]);
        }
        if (corner_signed_area(mesh, cell) < 0.0) {
          reverse_orientation(cell);
        }
        const int index = mesh.cell_count();
        const int corners = corner_count(type);
        for (int i = 0; i < corners; ++i) {
          const int a = cell.nodes[static_cast<std::size_t>(i)];
          const int b = cell.nodes[static_cast<std::size_t>((i + 1) % corners)];
          edge_map[{std::min(a, b), std::max(a, b)}] = {index, i};
        }
        mesh.cells.push_back(cell);
      }
    }
  }

  for (const SetPiece& piece : geometry.pieces()) {
    std::vector<Edge>& set = mesh.edge_sets[piece.set];
    const auto& edge_map = edges_of_surface.at(piece.surface);
    for (const GmshSession::Elements& block : session.elements_of(1, piece.curve)) {
      const int per = block.nodes_per_element;
      for (std::size_t e = 0; e * static_cast<std::size_t>(per) < block.node_tags.size(); ++e) {
        const int a = node(block.node_tags[e * static_cast<std::size_t>(per)]);
        const int b = node(block.node_tags[e * static_cast<std::size_t>(per) + 1]);
        const auto found = edge_map.find({std::min(a, b), std::max(a, b)});
        if (found == edge_map.end()) {
          throw MeshError("internal: edge of set '" + piece.set + "' bounds no cell of its patch");
        }
        const auto [cell_index, local] = found->second;
        const Cell& cell = mesh.cells[static_cast<std::size_t>(cell_index)];
        const int corners = corner_count(cell.type);
        Edge edge;
        edge.cell = cell_index;
        edge.local_edge = local;
        edge.nodes[0] = cell.nodes[static_cast<std::size_t>(local)];
        edge.nodes[1] = cell.nodes[static_cast<std::size_t>((local + 1) % corners)];
        edge.node_count = 2;
        if (polynomial_order(cell.type) == 2) {
          edge.nodes[2] = cell.nodes[static_cast<std::size_t>(corners + local)];
          edge.node_count = 3;
        }
        set.push_back(edge);
      }
    }
  }
  for (const std::string& name : geometry.pair_names()) {
    ContactPair pair{name, name + "-lower", name + "-upper"};
    mesh.edge_sets[pair.lower_edge_set];
    mesh.edge_sets[pair.upper_edge_set];
    mesh.contact_pairs.push_back(pair);
  }
  for (const auto& [name, edges] : mesh.edge_sets) {
    mesh.node_sets[name] = nodes_of_edge_set(mesh, name);
  }
  return mesh;
}

void add_physical_groups(GmshSession& session, const StackDescription& stack,
                         const StackGeometry& geometry) {
  std::map<int, std::vector<int>> surfaces_of_layer;
  for (const Patch& patch : geometry.patches()) {
    surfaces_of_layer[patch.layer].push_back(patch.surface);
  }
  for (const auto& [layer, surfaces] : surfaces_of_layer) {
    session.add_physical_group(2, surfaces, stack.layers[static_cast<std::size_t>(layer)].name);
  }
  std::map<std::string, std::set<int>> curves_of_set;
  for (const SetPiece& piece : geometry.pieces()) {
    curves_of_set[piece.set].insert(piece.curve);
  }
  for (const auto& [name, curves] : curves_of_set) {
    session.add_physical_group(1, std::vector<int>(curves.begin(), curves.end()), name);
  }
}

}  // namespace

Mesh build_stack_mesh(GmshSession& session, const StackDescription& stack) {
  validate_stack(stack);
  const Layout layout = detail::make_layout(stack);
  session.new_model("stack");
  StackGeometry geometry(session, stack, layout);
  geometry.build();
  add_physical_groups(session, stack, geometry);
  session.generate(stack.order);
  Mesh mesh = read_mesh(session, stack, geometry);
  const std::string problem = check_consistency(mesh);
  if (!problem.empty()) {
    throw MeshError("internal: the stack mesh is inconsistent: " + problem);
  }
  require_no_inverted_cells(mesh, measure_quality(mesh));
  return mesh;
}

Mesh build_stack_mesh(const StackDescription& stack) {
  validate_stack(stack);
  GmshSession session;
  return build_stack_mesh(session, stack);
}

}  // namespace plystrain::mesh
