// CaseSpec back to a document in the user's units, and a document to TOML.
#include "case_document.hpp"

#include "plystrain/solver/case_writer.hpp"

#include <sstream>

namespace plystrain::casefile {

namespace {

class DocumentWriter {
 public:
  DocumentWriter(const CaseSpec& spec, bool with_defaults, bool with_studies)
      : spec_(spec),
        with_defaults_(with_defaults),
        with_studies_(with_studies),
        scale_(micrometres_per(spec.units.value)) {}

  CaseDocument run() {
    document_.source = spec_.source;
    document_.top.present = true;
    put(document_.top, "format", spec_.format, [](int v) { return CaseValue{std::int64_t{v}}; });
    put(document_.top, "title", spec_.title, text);
    put(document_.top, "units", spec_.units,
        [](LengthUnit unit) { return CaseValue{std::string(unit_name(unit))}; });
    if (!spec_.material_files.empty()) {
      std::vector<std::string> files;
      for (const Located<std::string>& file : spec_.material_files) {
        files.push_back(file.value);
      }
      document_.top.entries["materials"] = Entry{CaseValue{files}, spec_.material_files.front().where};
    }

    Table& geometry = document_.geometry;
    geometry.present = true;
    geometry.where = spec_.geometry.where;
    put(geometry, "shape", spec_.geometry.shape,
        [](Shape shape) { return CaseValue{std::string(shape_name(shape))}; });
    if (spec_.geometry.defect_spacing.given) {
      put(geometry, "defect_spacing", spec_.geometry.defect_spacing, length());
    } else {
      put(geometry, "width", spec_.geometry.width, length());
    }
    put(geometry, "symmetric", spec_.geometry.symmetric, flag);

    for (const LayerSpec& layer : spec_.layers) {
      Table& table = document_.layers.emplace_back();
      table.present = true;
      table.where = layer.where;
      put(table, "name", layer.name, text);
      put(table, "role", layer.role,
          [](LayerRole role) { return CaseValue{std::string(role_name(role))}; });
      put(table, "material", layer.material, text);
      put(table, "thickness", layer.thickness, length());
      put(table, "elements_through", layer.elements_through, integer);
    }
    for (const DefectSpec& defect : spec_.defects) {
      Table& table = document_.defects.emplace_back();
      table.present = true;
      table.where = defect.where;
      const Shape shape = spec_.geometry.shape.value;
      put(table, "kind", defect.kind, [shape](DefectKind kind) {
        return CaseValue{std::string(defect_kind_name(kind, shape))};
      });
      put(table, "layer", defect.layer, text);
      put(table, "below", defect.below, text);
      put(table, "at", defect.at, length());
      put(table, "size", defect.size, length());
      put(table, "depth", defect.depth, number);
      put(table, "taper", defect.taper, length());
      put(table, "fill", defect.fill,
          [](DefectFill fill) { return CaseValue{std::string(fill_name(fill))}; });
    }
    write_load();
    write_mesh_and_report();
    if (with_studies_) {
      document_.variants = spec_.variants;
      document_.sweep = spec_.sweep;
    }
    if (with_defaults_) {
      drop_defaults_that_do_not_apply();
    }
    return document_;
  }

 private:
  const CaseSpec& spec_;
  bool with_defaults_;
  bool with_studies_;
  double scale_;
  CaseDocument document_;

  static CaseValue text(const std::string& value) { return CaseValue{value}; }
  static CaseValue flag(bool value) { return CaseValue{value}; }
  static CaseValue integer(int value) { return CaseValue{std::int64_t{value}}; }
  static CaseValue number(double value) { return CaseValue{value}; }
  struct ToUserLength {
    double scale;
    CaseValue operator()(double micrometres) const { return CaseValue{micrometres / scale}; }
  };
  [[nodiscard]] ToUserLength length() const { return ToUserLength{scale_}; }

  template <class T, class Convert>
  void put(Table& table, const char* key, const Located<T>& value, Convert convert) {
    if (value.given || with_defaults_) {
      table.entries[key] = Entry{convert(value.value), value.where, !value.given};
    }
  }

  void write_load() {
    const LoadSpec& load = spec_.load;
    Table& table = document_.load;
    table.present = true;
    table.where = load.where;
    put(table, "kind", load.kind,
        [](LoadKind kind) { return CaseValue{std::string(load_kind_name(kind))}; });
    put(table, "strain", load.strain, number);
    put(table, "lateral", load.lateral, [](const LateralCondition& lateral) {
      switch (lateral.mode) {
        case LateralMode::free: return CaseValue{std::string("free")};
        case LateralMode::held: return CaseValue{std::string("held")};
        case LateralMode::imposed: return CaseValue{lateral.strain};
      }
      return CaseValue{std::string("free")};
    });
    put(table, "radius", load.radius, [scale = scale_](const std::vector<double>& radii) {
      std::vector<double> shown;
      for (const double radius : radii) {
        shown.push_back(radius / scale);
      }
      return CaseValue{shown};
    });
    put(table, "surface", load.surface,
        [](SurfaceKind kind) { return CaseValue{std::string(surface_name(kind))}; });
    put(table, "surface_radius", load.surface_radius, length());
    put(table, "semi_axes", load.semi_axes, [scale = scale_](const std::array<double, 2>& axes) {
      return CaseValue{std::vector<double>{axes[0] / scale, axes[1] / scale}};
    });
    put(table, "points", load.points,
        [scale = scale_](const std::vector<std::array<double, 2>>& points) {
          std::vector<std::array<double, 2>> shown;
          for (const std::array<double, 2>& point : points) {
            shown.push_back({point[0] / scale, point[1] / scale});
          }
          return CaseValue{shown};
        });
    put(table, "method", load.method,
        [](ConformMethod method) { return CaseValue{std::string(method_name(method))}; });
    put(table, "ring", load.ring, length());
    put(table, "travel", load.travel, length());
    put(table, "contact", load.contact,
        [](ContactKind kind) { return CaseValue{std::string(contact_name(kind))}; });
    put(table, "local", load.local, flag);
    if (load.local_at.given && load.local_at.value) {
      table.entries["local_at"] = Entry{CaseValue{*load.local_at.value / scale_}, load.local_at.where};
    }
    put(table, "steps", load.steps, integer);
    put(table, "max_steps", load.max_steps, integer);
  }

  void write_mesh_and_report() {
    Table& mesh = document_.mesh;
    mesh.present = true;
    mesh.where = spec_.mesh.where;
    put(mesh, "size_near", spec_.mesh.size_near, length());
    put(mesh, "size_far", spec_.mesh.size_far, length());
    put(mesh, "grade_over", spec_.mesh.grade_over, length());
    put(mesh, "elements_through", spec_.mesh.elements_through, integer);
    put(mesh, "order", spec_.mesh.order, integer);

    Table& report = document_.report;
    report.present = true;
    report.where = spec_.report.where;
    put(report, "out", spec_.report.out,
        [](const std::filesystem::path& out) { return CaseValue{out.generic_string()}; });
    put(report, "averaging_radius", spec_.report.averaging_radius, length());
    put(report, "fields", spec_.report.fields, flag);
    put(report, "profiles", spec_.report.profiles, flag);
    put(report, "verify", spec_.report.verify, flag);
  }

  // Filled defaults of keys that do not apply (a lateral condition on a disk,
  // the depth of a pinhole) would only confuse a reader of the written case.
  void drop_defaults_that_do_not_apply() {
    const auto prune = [this](Table& table, CaseSection section) {
      for (auto entry = table.entries.begin(); entry != table.entries.end();) {
        const KeyInfo* key = find_case_key(section, entry->first);
        const bool drop = entry->second.is_default &&
                          (key == nullptr || key_applies(*key, table, document_) != Applies::yes);
        entry = drop ? table.entries.erase(entry) : std::next(entry);
      }
    };
    prune(document_.top, CaseSection::top);
    prune(document_.geometry, CaseSection::geometry);
    for (Table& layer : document_.layers) {
      prune(layer, CaseSection::layer);
    }
    for (Table& defect : document_.defects) {
      prune(defect, CaseSection::defect);
    }
    prune(document_.load, CaseSection::load);
    prune(document_.mesh, CaseSection::mesh);
    prune(document_.report, CaseSection::report);
  }
};

void render_table(std::ostringstream& text, const Table& table, CaseSection section) {
  for (const KeyInfo& key : case_key_table()) {
    if (key.section != section) {
      continue;
    }
    if (const Entry* entry = table.find(key.name)) {
      text << (entry->is_default ? "# " : "") << key.name << " = " << value_text(entry->value)
           << (entry->is_default ? "  # default" : "") << "\n";
    }
  }
}

std::string quoted_key(const std::string& path) { return value_text(CaseValue{path}); }

}  // namespace

CaseDocument document_from_case(const CaseSpec& spec, bool with_defaults, bool with_studies) {
  return DocumentWriter(spec, with_defaults, with_studies).run();
}

std::string render_case_document(const CaseDocument& document) {
  std::ostringstream text;
  render_table(text, document.top, CaseSection::top);
  text << "\n[geometry]\n";
  render_table(text, document.geometry, CaseSection::geometry);
  for (const Table& layer : document.layers) {
    text << "\n[[layer]]\n";
    render_table(text, layer, CaseSection::layer);
  }
  for (const Table& defect : document.defects) {
    text << "\n[[defect]]\n";
    render_table(text, defect, CaseSection::defect);
  }
  text << "\n[load]\n";
  render_table(text, document.load, CaseSection::load);
  if (!document.mesh.entries.empty()) {
    text << "\n[mesh]\n";
    render_table(text, document.mesh, CaseSection::mesh);
  }
  if (!document.report.entries.empty()) {
    text << "\n[report]\n";
    render_table(text, document.report, CaseSection::report);
  }
  for (const VariantSpec& variant : document.variants) {
    text << "\n[[variant]]\nname = " << value_text(CaseValue{variant.name.value}) << "\n";
    if (!variant.remove.empty()) {
      std::vector<std::string> names;
      for (const Located<std::string>& name : variant.remove) {
        names.push_back(name.value);
      }
      text << "remove = " << value_text(CaseValue{names}) << "\n";
    }
    if (!variant.set.empty()) {
      text << "set = { ";
      for (std::size_t i = 0; i < variant.set.size(); ++i) {
        text << (i > 0 ? ", " : "") << quoted_key(variant.set[i].path) << " = "
             << value_text(variant.set[i].value);
      }
      text << " }\n";
    }
  }
  if (document.sweep) {
    const SweepSpec& sweep = *document.sweep;
    text << "\n[sweep]\nparameter = " << value_text(CaseValue{sweep.parameter.value}) << "\n";
    if (sweep.range) {
      text << "from = " << float_text(sweep.range->from) << "\nto = " << float_text(sweep.range->to)
           << "\ncount = " << sweep.range->count << "\n";
    } else {
      text << "values = [";
      for (std::size_t i = 0; i < sweep.values.size(); ++i) {
        text << (i > 0 ? ", " : "") << value_text(sweep.values[i].value);
      }
      text << "]\n";
    }
  }
  return text.str();
}

}  // namespace plystrain::casefile

namespace plystrain {

std::string write_case_toml(const CaseSpec& spec) {
  return "# The case as run (lengths in " + std::string(unit_name(spec.units.value)) +
         "); commented lines show the defaults that were filled in.\n" +
         casefile::render_case_document(casefile::document_from_case(spec, true));
}

}  // namespace plystrain
