// Boundary conditions of the stack analyses.
//
// Stretch (strip): the outer edge moves by strain * width along x, the
// symmetry plane is held in x (or, on a full-width strip, the left edge moves
// the other way), one bottom node is held in z. The third direction follows
// `lateral`: free = generalized plane strain with zero out-of-plane resultant,
// held = plane strain, a number = generalized plane strain with that strain.
// A uniform edge displacement is consistent with the homogeneous solution of
// a bonded laminate (every layer then has the same in-plane strain), so the
// edge itself adds no concentration.
//
// Stretch (disk): axisymmetric, the outer edge moves radially by strain *
// radius: equibiaxial in-plane strain.
//
// Bend (strip): pure bending. The symmetry plane stays plane and vertical;
// the outer edge stays a straight line turned by width / R, free to
// translate, so there is no net axial force and the stack finds its own
// neutral plane.
// At the neutral plane the fibre keeps its length, so its radius is R
// (plane sections stay plane; exact for a bonded laminate, Timoshenko &
// Goodier, Theory of Elasticity, 1970, pure bending).
#include "plystrain/solver/stack_analysis.hpp"

#include "plystrain/solver/input_error.hpp"
#include "plystrain/solver/laminate_state.hpp"
#include "plystrain/solver/rigid_surface.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <memory>
#include <numbers>
#include <sstream>

namespace plystrain {

namespace {

int nearest_bottom_node(const mesh::Mesh& grid, double x_target) {
  std::vector<int> bottom = mesh::nodes_of_edge_set(grid, "bottom");
  if (bottom.empty()) {
    throw std::logic_error("stack mesh has no 'bottom' edge set");
  }
  int best = bottom.front();
  double best_distance = std::numeric_limits<double>::infinity();
  for (const int node : bottom) {
    const double distance = std::abs(grid.nodes[static_cast<std::size_t>(node)].x() - x_target);
    if (distance < best_distance) {
      best = node;
      best_distance = distance;
    }
  }
  return best;
}

void require_node_set(const mesh::Mesh& grid, const std::string& name) {
  if (!grid.node_sets.contains(name)) {
    throw std::logic_error("stack mesh has no '" + name + "' node set");
  }
}

solver::RigidSurface target_surface(const CaseSpec& spec) {
  const LoadSpec& load = spec.load;
  switch (load.surface.value) {
    case SurfaceKind::sphere:
      return solver::RigidSurface::ellipse(load.surface_radius.value, load.surface_radius.value);
    case SurfaceKind::ellipsoid:
      return solver::RigidSurface::ellipse(load.semi_axes.value[0], load.semi_axes.value[1]);
    case SurfaceKind::profile:
      try {
        return solver::RigidSurface::profile(load.points.value);
      } catch (const std::invalid_argument& error) {
        throw InputError(load.points.where, "load.points", error.what());
      }
  }
  throw std::logic_error("unknown surface kind");
}

solver::PrescribedDisplacement prescribe(const std::string& set, int component, double at_full) {
  solver::PrescribedDisplacement condition;
  condition.node_set = set;
  condition.component = component;
  condition.value.value = at_full;
  return condition;
}

std::vector<solver::RegionDefinition> region_laws(const CaseSpec& spec) {
  std::vector<solver::RegionDefinition> regions;
  for (const LayerSpec& layer : spec.layers) {
    const materials::MaterialRecord* record = spec.library.find(layer.material.value);
    if (record == nullptr) {
      throw InputError(layer.material.where, "layer." + layer.name.value + ".material",
                       "unknown material \"" + layer.material.value + "\"");
    }
    solver::RegionDefinition region;
    region.law = record->law;
    regions.push_back(region);
  }
  return regions;
}

void set_third_direction(const LateralCondition& lateral, solver::ModelDefinition& definition) {
  switch (lateral.mode) {
    case LateralMode::held:
      definition.kinematics = solver::Kinematics::plane_strain;
      break;
    case LateralMode::free:
      definition.kinematics = solver::Kinematics::generalized_plane_strain;
      definition.out_of_plane.prescribed_strain.reset();
      definition.out_of_plane.resultant.value = 0.0;
      break;
    case LateralMode::imposed:
      definition.kinematics = solver::Kinematics::generalized_plane_strain;
      definition.out_of_plane.prescribed_strain = solver::ScaledValue{lateral.strain, {}};
      break;
  }
}

nonlinear::LoadStepperOptions stepper_options(const CaseSpec& spec) {
  nonlinear::LoadStepperOptions options;
  options.steps = spec.load.steps.value;
  options.max_steps = spec.load.max_steps.value;
  options.max_increment = 1.0 / std::max(1, spec.load.steps.value) * 4.0;
  // Starting each increment from the last state moves only the loaded edge
  // and folds the cells beside it; the tangent predictor carries the edge
  // motion into the interior. A short geometric ramp keeps the first
  // increments in Newton's basin while the stiffness is found. A debonded film span has almost no bending
  // stiffness, so it needs a far smaller first fraction (verification.md,
  // section 6).
  options.predictor = nonlinear::Predictor::tangent;
  options.geometric_ramp = true;
  options.ramp_first_fraction = 1e-3;
  options.ramp_growth_factor = 3.0;
  for (const DefectSpec& defect : spec.defects) {
    if (defect.kind.value == DefectKind::delamination) {
      options.ramp_first_fraction = 1e-5;
    }
  }
  if (spec.load.kind.value == LoadKind::conform) {
    // Each increment of a conform run moves the edge of the contact zone
    // over a few nodes, and every change of the touching set costs Newton
    // another few iterations at the same load: an increment that needed
    // eight is still an easy one.
    options.easy_iterations = 8;
    if (spec.load.method.value == ConformMethod::press) {
      // The first touch: a flat sheet pushed at one point answers as a plate
      // while the travel is below its thickness and as a membrane beyond, and
      // Newton crosses that change only in small steps. The first increment
      // stays at a tenth of the stack's thickness.
      const double first_travel = 0.1 * spec.total_thickness() / spec.load.travel.value;
      options.ramp_first_fraction = std::min(options.ramp_first_fraction, first_travel);
      // Each increment moves the contact front over several nodes; Newton
      // crawls under the line search while the front settles and then
      // converges quadratically (measured on a sheet pressed over a whole
      // hemisphere: with four iterations allowed to halve the residual, 17
      // cut-backs more and the path stops at 90 % of the travel).
      options.newton.progress_window = 8;
      // Where a node meets the surface within a step, the penalty force
      // makes the residual norm jump while the energy hardly moves: the
      // search follows the energy (the press is conservative: hyperelastic
      // layers, frictionless or bonded penalty contact on a rigid surface).
      options.newton.line_search_merit = nonlinear::LineSearchMerit::energy_slope;
      options.easy_iterations = 15;
      options.newton.max_iterations = 40;
    }
  }
  // A residual below 1e-11 of the force that would strain the whole section
  // by 100 % in its stiffest material is rounding: it ends Newton even where
  // the increment starts from a state that carries no load at all (a press
  // before the surface has touched).
  double stiffest = 0.0;
  for (const solver::RegionDefinition& region : region_laws(spec)) {
    stiffest = std::max(stiffest, materials::initial_youngs_modulus(region.law));
  }
  const double width = spec.geometry.width.value;
  const double section = spec.total_thickness() * width *
                         (spec.geometry.shape.value == Shape::disk ? std::numbers::pi * width : 1.0);
  options.newton.residual_floor = std::max(options.newton.residual_floor, 1e-11 * stiffest * section);
  return options;
}

// The nominal stress P_xx of each layer in the undisturbed laminate state,
// tabulated over the load factor for the edge traction of an isolated
// defect. The state at a tabulated load factor (1 among them) is exact;
// between two, the traction is interpolated linearly.
class LaminateTractionTable {
 public:
  LaminateTractionTable(const CaseSpec& spec,
                        const std::vector<solver::RegionDefinition>& regions) {
    std::vector<LaminateLayer> layers;
    double top = 0.0;
    for (std::size_t i = 0; i < spec.layers.size(); ++i) {
      layers.push_back({regions[i].law, spec.layers[i].thickness.value});
      top += spec.layers[i].thickness.value;
      layer_tops_.push_back(top);
    }
    const double strain = spec.load.strain.value;
    const LateralCondition& lateral = spec.load.lateral.value;
    std::optional<LaminateState> previous;
    for (int k = 0; k <= samples; ++k) {
      const double lambda = static_cast<double>(k) / samples;
      ThirdStretch third;
      if (spec.geometry.shape.value == Shape::disk) {
        third.kind = ThirdStretch::Kind::equibiaxial;
      } else if (lateral.mode == LateralMode::free) {
        third.kind = ThirdStretch::Kind::free;
      } else {
        third.value = lateral.mode == LateralMode::imposed ? 1.0 + lambda * lateral.strain : 1.0;
      }
      const std::optional<LaminateState> state =
          stretched_laminate(layers, 1.0 + lambda * strain, third, previous ? &*previous : nullptr);
      if (!state) {
        throw InputError(
            spec.load.strain.where, "load.strain",
            "the stack without its defects has no uniform stretched state at this strain "
            "(a material law leaves its domain), found " +
                std::to_string(strain));
      }
      stresses_.push_back(state->nominal_stress_xx);
      previous = state;
    }
  }

  // P_xx at reference height z and load factor lambda (extrapolated
  // linearly past the ends, for the load derivative's difference quotient).
  [[nodiscard]] double at(double z, double lambda) const {
    std::size_t layer = 0;
    while (layer + 1 < layer_tops_.size() && z > layer_tops_[layer]) {
      ++layer;
    }
    const double position = std::clamp(lambda, 0.0, 1.0) * samples;
    const int k = std::min(static_cast<int>(std::floor(position)), samples - 1);
    const double a = stresses_[static_cast<std::size_t>(k)][layer];
    const double b = stresses_[static_cast<std::size_t>(k + 1)][layer];
    return a + (lambda * samples - k) * (b - a);
  }

 private:
  static constexpr int samples = 400;
  std::vector<double> layer_tops_;
  std::vector<std::vector<double>> stresses_;  // per sample, per layer
};

solver::DeadTraction edge_traction(const std::string& set,
                                   std::shared_ptr<const LaminateTractionTable> table,
                                   double sign) {
  solver::DeadTraction traction;
  traction.edge_set = set;
  traction.traction = [table = std::move(table), sign](const Eigen::Vector2d& X, double lambda) {
    return Eigen::Vector2d(sign * table->at(X.y(), lambda), 0.0);
  };
  return traction;
}

solver::ModelDefinition stretch_definition(const CaseSpec& spec, const mesh::Mesh& grid) {
  solver::ModelDefinition definition;
  definition.regions = region_laws(spec);
  const double width = spec.geometry.width.value;
  const double strain = spec.load.strain.value;
  require_node_set(grid, "outer");
  // A stated row of defects is a periodic cell: its mean strain is the
  // applied one, so the edge moves by strain * width. An isolated defect
  // sits in a stack strained by the applied amount far from it.
  // Without defects the two are the same state; the plain edge
  // displacement is then kept for its simplicity.
  const bool periodic = spec.geometry.defect_spacing.given || spec.defects.empty();
  std::shared_ptr<const LaminateTractionTable> table;
  if (periodic) {
    definition.displacements.push_back(prescribe("outer", 0, strain * width));
  } else {
    // The edge carries the undisturbed laminate's stress, layer by layer:
    // far from the defect the stack is then in exactly that state, and what
    // the defect takes up on its own (a slit opens, a debond slides) moves
    // the edge instead of coming off the strain of the whole cell, a deficit
    // that would fall only as 1 / width under a prescribed edge displacement.
    table = std::make_shared<const LaminateTractionTable>(spec, definition.regions);
    definition.tractions.push_back(edge_traction("outer", table, 1.0));
  }
  definition.displacements.push_back(prescribe(anchor_node_set, 1, 0.0));
  if (spec.geometry.shape.value == Shape::disk) {
    // The model holds u_r = 0 on the axis by itself.
    definition.kinematics = solver::Kinematics::axisymmetric;
    return definition;
  }
  set_third_direction(spec.load.lateral.value, definition);
  if (spec.geometry.symmetric.value) {
    require_node_set(grid, "symmetry");
    definition.displacements.push_back(solver::symmetry("symmetry", 0));
  } else {
    require_node_set(grid, "outer-left");
    if (periodic) {
      definition.displacements.push_back(prescribe("outer-left", 0, -strain * width));
    } else {
      definition.tractions.push_back(edge_traction("outer-left", table, -1.0));
      definition.displacements.push_back(prescribe(anchor_node_set, 0, 0.0));
    }
  }
  return definition;
}

// The loaded edge of a bend stays a straight line turned by the end
// rotation phi(lambda) = lambda width / R (clockwise for a positive radius,
// so the top moves outwards), free to translate and with each node free to
// slide along it (solver::StraightEdge): the plane, radial section of pure
// bending, held exactly at any rotation, so that every layer contracts or
// swells through its thickness as it does far from the edge and the edge adds
// no disturbance of its own.
void add_turned_edge(const std::string& set, double end_angle,
                     solver::ModelDefinition& definition) {
  solver::StraightEdge edge;
  edge.edge_set = set;
  edge.angle.value = end_angle;  // times lambda
  definition.straight_edges.push_back(std::move(edge));
}

solver::ModelDefinition bend_definition(const CaseSpec& spec, const mesh::Mesh& grid,
                                        double radius) {
  solver::ModelDefinition definition;
  definition.regions = region_laws(spec);
  set_third_direction(spec.load.lateral.value, definition);
  const double width = spec.geometry.width.value;
  // Positive radius: the top of the stack on the convex side, so the top of
  // the outer edge moves outwards.
  const double end_angle = width / radius;
  require_node_set(grid, "outer");
  add_turned_edge("outer", end_angle, definition);
  definition.displacements.push_back(prescribe(anchor_node_set, 1, 0.0));
  if (spec.geometry.symmetric.value) {
    require_node_set(grid, "symmetry");
    definition.displacements.push_back(solver::symmetry("symmetry", 0));
  } else {
    require_node_set(grid, "outer-left");
    add_turned_edge("outer-left", -end_angle, definition);
    definition.displacements.push_back(prescribe(anchor_node_set, 0, 0.0));
  }
  return definition;
}

solver::ScaledValue constant(double value) {
  solver::ScaledValue scaled;
  scaled.function = [value](double) { return value; };
  return scaled;
}

// The penalty of a pressed sheet. A thin sheet resists a push across it by
// bending and membrane tension, far less than through its thickness, and
// against that the default penalty (1e3 E / h) leaves Newton's steps without
// accurate digits at first touch; a thick one needs a stiff penalty to keep
// its penetration within tolerance. The factor follows the slenderness
// squared between those bounds: measured, a 5 um sheet on a 1 mm ring
// (h/a = 0.005) reaches the full hemisphere at 10 and stalls at first touch
// at 100, and a 0.1 mm patch on a 5 mm ring (h/a = 0.02) sinks 0.022 of its
// node spacing into the mould at 10 (tolerance 0.01) and 0.002 at 100.
double press_penalty_factor(double thickness, double ring_radius) {
  const double slenderness = thickness / ring_radius;
  return std::clamp(4e5 * slenderness * slenderness, 10.0, 1e3);
}

// Conform (disk): the bottom face meets a rigid surface of revolution whose
// apex is on the axis at the bottom face's height.
//
// Wrap: the face is held on the surface, sliding freely, with the rim free.
// The load factor scales the surface's height from flat (0) to the full
// shape (1), so every increment lays the device onto a slightly more curved
// version of it: the strain grows smoothly from zero, and because the
// contact is frictionless and the materials elastic the end state does not
// depend on the path.
//
// Press: the rim is held (the outer edge when the ring is at the edge, else
// the bottom face outside the ring radius) and the surface rises by
// lambda * travel, touching first at the centre.
solver::ModelDefinition conform_definition(const CaseSpec& spec, mesh::Mesh& grid) {
  solver::ModelDefinition definition;
  definition.regions = region_laws(spec);
  definition.kinematics = solver::Kinematics::axisymmetric;
  solver::SurfaceContact contact;
  contact.edge_set = "bottom";
  contact.surface = target_surface(spec);
  if (spec.load.method.value == ConformMethod::wrap) {
    contact.kind = solver::SurfaceContactKind::held_on;
    contact.height_scale.value = 1.0;  // = lambda
    contact.lift = constant(0.0);
  } else {
    contact.kind = spec.load.contact.value == ContactKind::bonded ? solver::SurfaceContactKind::bonded
                                                                  : solver::SurfaceContactKind::frictionless;
    contact.height_scale = constant(1.0);
    contact.lift.value = spec.load.travel.value;
    contact.penalty_factor = press_penalty_factor(spec.total_thickness(), spec.load.ring.value);
    const double width = spec.geometry.width.value;
    const double ring = spec.load.ring.value;
    std::string held = "outer";
    if (ring < width * (1.0 - 1e-9)) {
      held = "ring-clamp";
      std::vector<int>& clamp = grid.node_sets[held];
      clamp.clear();
      for (const int node : mesh::nodes_of_edge_set(grid, "bottom")) {
        if (grid.nodes[static_cast<std::size_t>(node)].x() >= ring * (1.0 - 1e-9)) {
          clamp.push_back(node);
        }
      }
      if (clamp.empty()) {
        throw InputError(spec.load.ring.where, "load.ring", "no node of the bottom face lies outside the ring");
      }
    } else {
      require_node_set(grid, held);
    }
    definition.displacements.push_back(prescribe(held, 0, 0.0));
    definition.displacements.push_back(prescribe(held, 1, 0.0));
  }
  definition.surface_contacts.push_back(std::move(contact));
  return definition;
}

std::string length_label(double micrometres, LengthUnit unit) {
  std::ostringstream text;
  text << micrometres / micrometres_per(unit) << " " << unit_name(unit);
  return text.str();
}

}  // namespace

std::vector<LoadCase> build_load_cases(const CaseSpec& spec, mesh::Mesh& grid) {
  // x = 0 is the symmetry plane, the axis, or the middle of a full strip.
  grid.node_sets[anchor_node_set] = {nearest_bottom_node(grid, 0.0)};

  // Every unbonded span of an interface: frictionless contact between its
  // two faces, whatever the load.
  std::vector<solver::FaceContact> contacts;
  for (const mesh::ContactPair& pair : grid.contact_pairs) {
    solver::FaceContact contact;
    contact.lower_edge_set = pair.lower_edge_set;
    contact.upper_edge_set = pair.upper_edge_set;
    contacts.push_back(contact);
  }

  std::vector<LoadCase> cases;
  switch (spec.load.kind.value) {
    case LoadKind::stretch: {
      LoadCase load_case;
      load_case.definition = stretch_definition(spec, grid);
      load_case.stepper = stepper_options(spec);
      cases.push_back(std::move(load_case));
      break;
    }
    case LoadKind::bend: {
      const std::vector<double>& radii = spec.load.radius.value;
      for (const double radius : radii) {
        LoadCase load_case;
        load_case.bend_radius = radius;
        if (radii.size() > 1) {
          load_case.label = "radius " + length_label(radius, spec.units.value);
        }
        load_case.definition = bend_definition(spec, grid, radius);
        load_case.stepper = stepper_options(spec);
        cases.push_back(std::move(load_case));
      }
      break;
    }
    case LoadKind::conform: {
      LoadCase load_case;
      load_case.definition = conform_definition(spec, grid);
      load_case.stepper = stepper_options(spec);
      cases.push_back(std::move(load_case));
      break;
    }
  }
  for (LoadCase& load_case : cases) {
    load_case.definition.contacts = contacts;
  }
  return cases;
}

std::string lateral_text(const CaseSpec& spec) {
  if (spec.geometry.shape.value == Shape::disk || spec.load.kind.value == LoadKind::conform) {
    return "";
  }
  const LateralCondition& lateral = spec.load.lateral.value;
  switch (lateral.mode) {
    case LateralMode::free: return "free";
    case LateralMode::held: return "held";
    case LateralMode::imposed: {
      std::ostringstream text;
      text << lateral.strain;
      return text.str();
    }
  }
  return "";
}

}  // namespace plystrain

namespace plystrain {

std::optional<CaseSpec> undisturbed_case(const CaseSpec& spec, double load_factor) {
  CaseSpec reference = spec;
  reference.defects.clear();
  reference.variants.clear();
  reference.sweep.reset();
  reference.title.value = spec.title.value + ", undisturbed state";
  // Every load of the stack analyses is proportional to the load factor
  // (edge displacement and imposed lateral strain, end rotation, press
  // travel), so the state at lambda is the full state of the load times
  // lambda. A wrap grows the surface's height, which is not a scaled case.
  LoadSpec& load = reference.load;
  switch (load.kind.value) {
    case LoadKind::stretch:
      load.strain.value *= load_factor;
      if (load.lateral.value.mode == LateralMode::imposed) {
        load.lateral.value.strain *= load_factor;
      }
      break;
    case LoadKind::bend:
      for (double& radius : load.radius.value) {
        radius /= load_factor;
      }
      break;
    case LoadKind::conform:
      if (load.method.value == ConformMethod::wrap && load_factor < 1.0) {
        return std::nullopt;
      }
      load.travel.value *= load_factor;
      return reference;
  }
  // The laminate state does not vary along x: a cell one stack thickness
  // wide holds it whole (a uniform stretch is reproduced exactly by any
  // element, pure bending by quadratic ones). Its far size stays the case's,
  // so that every layer has as many cells through its thickness as in the
  // case's own mesh (the mesher sets that count from size_far): a layer's
  // largest strain in bending is read at its outermost integration points,
  // and they then sit at the same heights in both.
  const double width = std::max(spec.total_thickness(), spec.mesh.size_far.value);
  reference.geometry.width.value = width;
  reference.geometry.defect_spacing.given = false;
  reference.geometry.symmetric.value = true;
  reference.mesh.grade_over.value = width;
  return reference;
}

}  // namespace plystrain
