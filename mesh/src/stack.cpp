#include "plystrain/mesh/stack.hpp"

#include "plystrain/mesh/mesh_error.hpp"
#include "plystrain/mesh/stack_mesher.hpp"
#include "stack_layout.hpp"

#include <cmath>
#include <sstream>

namespace plystrain::mesh {

std::string delamination_name(const StackDefect& defect) {
  return "delamination-" + std::to_string(defect.case_index);
}

namespace {

std::string number(double value) {
  std::ostringstream text;
  text << value;
  return text.str();
}

const char* kind_name(DefectKind kind) {
  switch (kind) {
    case DefectKind::pinhole: return "pinhole";
    case DefectKind::thin_spot: return "thin spot";
    case DefectKind::delamination: return "delamination";
  }
  return "defect";
}

void check_defect(const StackDescription& stack, const StackDefect& defect) {
  const int layers = static_cast<int>(stack.layers.size());
  const auto fail = [&](const std::string& message) {
    throw MeshError::for_defect(defect.case_index,
                                std::string(kind_name(defect.kind)) + ": " + message);
  };
  if (defect.kind == DefectKind::delamination) {
    if (defect.layer < 0 || defect.layer >= layers - 1) {
      fail("the unbonded face must be the top of a layer that has a layer above it");
    }
  } else if (defect.layer < 0 || defect.layer >= layers) {
    fail("layer index " + std::to_string(defect.layer) + " is not in the stack");
  }
  if (!(defect.size > 0.0) || !std::isfinite(defect.size)) {
    fail("size must be > 0, got " + number(defect.size));
  }
  if (!std::isfinite(defect.at)) {
    fail("position must be finite");
  }
  if (defect.kind == DefectKind::thin_spot) {
    if (!(defect.depth > 0.0 && defect.depth < 1.0)) {
      fail("depth must be a fraction in (0, 1), got " + number(defect.depth));
    }
    if (!(defect.taper >= 0.0)) {
      fail("taper must be >= 0, got " + number(defect.taper));
    }
    if (2.0 * defect.taper > defect.size) {
      fail("taper " + number(defect.taper) + " is wider than half the spot (size " +
           number(defect.size) + ")");
    }
  }
  const bool mirrored = stack.shape == StackShape::disk || stack.symmetric;
  const double lo = defect.at - 0.5 * defect.size;
  const double hi = defect.at + 0.5 * defect.size;
  if (mirrored) {
    const char* plane = stack.shape == StackShape::disk ? "axis" : "symmetry plane";
    if (defect.at < 0.0) {
      fail(std::string("position must be >= 0 (measured from the ") + plane + "), got " +
           number(defect.at));
    }
    if (defect.at > 0.0 && lo < 0.0) {
      fail(std::string("extends across the ") + plane + " (at " + number(defect.at) +
           ", size " + number(defect.size) +
           "); centre it on the " + plane + " (at = 0) or move it off");
    }
  } else if (lo < -stack.width) {
    fail("extends beyond x = -width (" + number(lo) + " < " + number(-stack.width) + ")");
  }
  if (hi > stack.width) {
    fail("extends beyond the width (" + number(hi) + " > " + number(stack.width) + ")");
  }
}

bool overlap(const detail::DefectExtent& a, const detail::DefectExtent& b) {
  return a.lo < b.hi && b.lo < a.hi;
}

}  // namespace

void validate_stack(const StackDescription& stack) {
  if (!(stack.width > 0.0) || !std::isfinite(stack.width)) {
    throw MeshError("width must be > 0, got " + number(stack.width));
  }
  if (stack.layers.empty()) {
    throw MeshError("the stack has no layers");
  }
  for (std::size_t l = 0; l < stack.layers.size(); ++l) {
    const StackLayer& layer = stack.layers[l];
    if (!(layer.thickness > 0.0) || !std::isfinite(layer.thickness)) {
      throw MeshError::for_layer(static_cast<int>(l), "layer '" + layer.name +
                                                          "': thickness must be > 0, got " +
                                                          number(layer.thickness));
    }
    if (layer.elements_through < 1) {
      throw MeshError::for_layer(static_cast<int>(l),
                                 "layer '" + layer.name + "': elements_through must be >= 1");
    }
  }
  if (!(stack.size_near > 0.0) || !(stack.size_far > 0.0) || !(stack.grade_over > 0.0)) {
    throw MeshError("size_near, size_far and grade_over must be > 0");
  }
  if (stack.order != 1 && stack.order != 2) {
    throw MeshError("order must be 1 or 2, got " + std::to_string(stack.order));
  }
  for (const StackDefect& defect : stack.defects) {
    check_defect(stack, defect);
  }
  // Two cavities in one layer, or two delaminations of one face, must not
  // overlap: their union is not a defect the case format can describe.
  for (std::size_t i = 0; i < stack.defects.size(); ++i) {
    for (std::size_t j = i + 1; j < stack.defects.size(); ++j) {
      const StackDefect& a = stack.defects[i];
      const StackDefect& b = stack.defects[j];
      const bool a_face = a.kind == DefectKind::delamination;
      const bool b_face = b.kind == DefectKind::delamination;
      if (a.layer != b.layer || a_face != b_face) {
        continue;
      }
      const detail::DefectExtent ea = detail::extent_of(a);
      const detail::DefectExtent eb = detail::extent_of(b);
      const bool both_stepped = a.kind == DefectKind::thin_spot && b.kind == DefectKind::thin_spot &&
                                a.taper == 0.0 && b.taper == 0.0;
      if (both_stepped && a.depth != b.depth) {
        throw MeshError::for_defect(
            b.case_index, "thin spot: stepped thin spots in one layer must share one depth (defect " +
                              std::to_string(a.case_index) + " has " + number(a.depth) +
                              "); give one of them a taper");
      }
      const bool touching = a_face && (ea.hi == eb.lo || eb.hi == ea.lo);
      if (overlap(ea, eb) || touching) {
        throw MeshError::for_defect(
            b.case_index, std::string(kind_name(b.kind)) + " overlaps defect " +
                              std::to_string(a.case_index) + " in the same " +
                              (a_face ? "interface" : "layer") + "; merge them into one");
      }
    }
  }
}

}  // namespace plystrain::mesh
