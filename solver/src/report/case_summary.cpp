#include "plystrain/solver/case_summary.hpp"

#include "plystrain/materials/law.hpp"
#include "plystrain/solver/input_text.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <sstream>
#include <string>
#include <vector>

namespace plystrain {

namespace {

std::string format_number(double value) {
  char buffer[64];
  std::snprintf(buffer, sizeof buffer, "%.4g", value);
  return buffer;
}

std::string percent(double fraction) { return format_number(100.0 * fraction) + " %"; }

std::string pad(const std::string& text, std::size_t width) {
  return text.size() >= width ? text + " " : text + std::string(width - text.size(), ' ');
}

// A simple left-aligned text table: the first row is the header.
std::string render_table(const std::vector<std::vector<std::string>>& rows) {
  std::vector<std::size_t> widths;
  for (const auto& row : rows) {
    widths.resize(std::max(widths.size(), row.size()), 0);
    for (std::size_t c = 0; c < row.size(); ++c) {
      widths[c] = std::max(widths[c], row[c].size() + 2);
    }
  }
  std::ostringstream out;
  for (std::size_t r = 0; r < rows.size(); ++r) {
    std::string line = "  ";
    for (std::size_t c = 0; c < rows[r].size(); ++c) {
      line += c + 1 == rows[r].size() ? rows[r][c] : pad(rows[r][c], widths[c]);
    }
    out << line << "\n";
    if (r == 0) {
      std::size_t total = 0;
      for (const std::size_t w : widths) {
        total += w;
      }
      out << "  " << std::string(total > 2 ? total - 2 : total, '-') << "\n";
    }
  }
  return out.str();
}

std::string modulus_text(const materials::MaterialRecord& record) {
  const double mu = materials::initial_shear_modulus(record.law);
  const double kappa = materials::initial_bulk_modulus(record.law);
  if (!(mu > 0.0) || !(kappa > 0.0)) {
    return "?";
  }
  const materials::YoungPoisson young = materials::to_young_poisson(mu, kappa);
  return format_number(young.youngs_modulus) + " MPa";
}

std::string optional_percent(const std::optional<double>& value) {
  return value ? percent(*value) : std::string("-");
}

std::string defect_line(const DefectSpec& defect, const CaseSpec& spec) {
  const LengthUnit unit = spec.units.value;
  const bool disk = spec.geometry.shape.value == Shape::disk;
  const std::string coordinate = disk ? "r" : "x";
  std::ostringstream line;
  switch (defect.kind.value) {
    case DefectKind::pinhole:
      line << (disk ? "round pinhole" : "slit across the device") << " through \""
           << defect.layer.value << "\"";
      break;
    case DefectKind::thin_spot:
      line << (disk ? "thin spot" : "groove across the device") << " in \"" << defect.layer.value
           << "\", " << percent(defect.depth.value) << " of its thickness missing";
      if (defect.taper.value > 0.0) {
        line << ", taper " << format_length(defect.taper.value, unit);
      }
      break;
    case DefectKind::delamination:
      line << (disk ? "delamination" : "delaminated band across the device")
           << " on the top face of \"" << defect.below.value << "\"";
      break;
  }
  const std::string size_word = disk && defect.at.value == 0.0 ? "diameter" : "width";
  line << "; " << size_word << " " << format_length(defect.size.value, unit) << " at "
       << coordinate << " = " << format_length(defect.at.value, unit);
  if (disk && defect.at.value > 0.0) {
    line << " (a ring)";
  }
  if (defect.kind.value != DefectKind::delamination) {
    line << (defect.fill.value == DefectFill::above ? "; filled by the layer above"
                                                    : "; left empty (void)");
  }
  return line.str();
}

std::string lateral_text(const LateralCondition& lateral) {
  switch (lateral.mode) {
    case LateralMode::free: return "free (no net force across the strip)";
    case LateralMode::held: return "held (plane strain)";
    case LateralMode::imposed: return "imposed strain " + percent(lateral.strain);
  }
  return "?";
}

std::string load_text(const CaseSpec& spec) {
  const LoadSpec& load = spec.load;
  const LengthUnit unit = spec.units.value;
  std::ostringstream text;
  switch (load.kind.value) {
    case LoadKind::stretch:
      text << "stretch: " << percent(load.strain.value) << " nominal strain "
           << (spec.geometry.shape.value == Shape::disk ? "equibiaxially in the plane"
                                                        : "along x");
      if (spec.geometry.shape.value == Shape::strip) {
        text << "; third direction " << lateral_text(load.lateral.value);
      }
      break;
    case LoadKind::bend: {
      text << "bend: neutral-plane radius ";
      for (std::size_t i = 0; i < load.radius.value.size(); ++i) {
        text << (i > 0 ? ", " : "") << format_length(load.radius.value[i], unit);
      }
      text << " (positive: top of the stack convex); third direction "
           << lateral_text(load.lateral.value);
      break;
    }
    case LoadKind::conform: {
      text << "conform (" << method_name(load.method.value) << ") onto a "
           << surface_name(load.surface.value);
      if (load.surface.value == SurfaceKind::sphere) {
        text << " of radius " << format_length(load.surface_radius.value, unit);
      } else if (load.surface.value == SurfaceKind::ellipsoid) {
        text << " with semi-axes " << format_length(load.semi_axes.value[0], unit) << " (in plane), "
             << format_length(load.semi_axes.value[1], unit) << " (height)";
      } else {
        text << " given by " << load.points.value.size() << " points";
      }
      if (load.method.value == ConformMethod::press) {
        text << "; rim held at r = " << format_length(load.ring.value, unit) << ", travel "
             << format_length(load.travel.value, unit) << ", " << contact_name(load.contact.value)
             << " contact";
      }
      if (load.local.value) {
        text << "; defects re-analysed in local cells";
      }
      break;
    }
  }
  text << "\n  first " << load.steps.value << " increments, at most " << load.max_steps.value;
  return text.str();
}

}  // namespace

std::string format_length(double micrometres, LengthUnit unit) {
  return format_number(micrometres / micrometres_per(unit)) + " " + unit_name(unit);
}

std::string format_case_summary(const CaseSpec& spec) {
  const LengthUnit unit = spec.units.value;
  std::ostringstream out;
  out << spec.title.value << "\n";
  // The path is the user's to name; it is shown, not obeyed, by a terminal.
  out << "  case file: " << escape_control_characters(spec.source.string()) << "\n";
  out << "  shape: " << shape_name(spec.geometry.shape.value);
  if (spec.geometry.shape.value == Shape::strip) {
    out << (spec.geometry.symmetric.value ? ", symmetric about x = 0, half-width "
                                          : ", full width, from -w to w, w = ")
        << format_length(spec.geometry.width.value, unit);
  } else {
    out << " (axisymmetric about r = 0), radius " << format_length(spec.geometry.width.value, unit);
  }
  out << "\n\nStack, bottom (1) to top (" << spec.layers.size() << "):\n";

  std::vector<std::vector<std::string>> rows;
  rows.push_back({"#", "layer", "role", "material", "thickness", "E", "crack onset", "yield",
                  "basis"});
  for (std::size_t i = 0; i < spec.layers.size(); ++i) {
    const LayerSpec& layer = spec.layers[i];
    const materials::MaterialRecord* record = spec.library.find(layer.material.value);
    rows.push_back({std::to_string(i + 1), layer.name.value, role_name(layer.role.value),
                    layer.material.value, format_length(layer.thickness.value, unit),
                    record ? modulus_text(*record) : "?",
                    record ? optional_percent(record->crack_onset_strain) : "?",
                    record ? optional_percent(record->yield_strain) : "?",
                    record ? record->basis : "?"});
  }
  out << render_table(rows);
  out << "  total thickness " << format_length(spec.total_thickness(), unit) << "\n";

  out << "\nDefects:";
  if (spec.defects.empty()) {
    out << " none\n";
  } else {
    out << "\n";
    for (std::size_t i = 0; i < spec.defects.size(); ++i) {
      out << "  " << (i + 1) << ". " << defect_line(spec.defects[i], spec) << "\n";
    }
  }

  out << "\nLoad:\n  " << load_text(spec) << "\n";

  out << "\nMesh: size near defects " << format_length(spec.mesh.size_near.value, unit)
      << ", far " << format_length(spec.mesh.size_far.value, unit) << ", graded over "
      << format_length(spec.mesh.grade_over.value, unit) << ", at least "
      << spec.mesh.elements_through.value << " elements through each layer, order "
      << spec.mesh.order.value << "\n";
  out << "Report: peaks averaged over a radius of "
      << format_length(spec.report.averaging_radius.value, unit) << "; output to "
      << spec.report.out.value.string() << "\n";

  if (!spec.variants.empty()) {
    out << "\nVariants:\n";
    for (const VariantSpec& variant : spec.variants) {
      out << "  " << variant.name.value << ":";
      for (const Located<std::string>& removed : variant.remove) {
        out << " remove " << removed.value << ";";
      }
      for (const SetChange& change : variant.set) {
        out << " " << change.path << " = " << case_value_text(change.value) << ";";
      }
      out << "\n";
    }
  }
  if (spec.sweep) {
    out << "\nSweep of " << spec.sweep->parameter.value << " over " << spec.sweep->values.size()
        << " values\n";
  }

  bool has_unconfirmed = false;
  for (const LayerSpec& layer : spec.layers) {
    const materials::MaterialRecord* record = spec.library.find(layer.material.value);
    if (record && (record->basis == "from-memory" || record->basis == "demo")) {
      has_unconfirmed = true;
    }
  }
  if (has_unconfirmed) {
    out << "\nNote: some materials rest on from-memory or demo values (see the basis column);\n"
           "margins built on them are indicative only.\n";
  }
  return out.str();
}

}  // namespace plystrain
