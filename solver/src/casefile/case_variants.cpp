#include "plystrain/solver/case_variants.hpp"

#include "case_document.hpp"
#include "plystrain/solver/input_text.hpp"

#include <set>

namespace plystrain {

namespace {

using casefile::CaseDocument;
using casefile::Table;

// Drops base entries that no longer apply after a change; a dropped key can
// decide others, so repeat until nothing changes.
void drop_inapplicable(CaseDocument& document) {
  bool dropped = true;
  while (dropped) {
    dropped = false;
    const auto prune = [&](Table& table, CaseSection section) {
      for (auto entry = table.entries.begin(); entry != table.entries.end();) {
        const KeyInfo* key = find_case_key(section, entry->first);
        const bool drop = !entry->second.from_change && key != nullptr &&
                          casefile::key_applies(*key, table, document) == casefile::Applies::no;
        dropped = dropped || drop;
        entry = drop ? table.entries.erase(entry) : std::next(entry);
      }
    };
    prune(document.geometry, CaseSection::geometry);
    for (Table& layer : document.layers) {
      prune(layer, CaseSection::layer);
    }
    for (Table& defect : document.defects) {
      prune(defect, CaseSection::defect);
    }
    prune(document.load, CaseSection::load);
  }
}

std::string name_of(const Table& layer) {
  const std::string* name = layer.text("name");
  return name == nullptr ? std::string{} : *name;
}

// Whether removing `removed` takes away the defect: its layer, or for a
// delamination either face of its interface.
bool loses_defect(const Table& defect, const std::vector<Table>& layers,
                  const std::set<std::string>& removed) {
  const std::string* kind = defect.text("kind");
  const bool delamination = kind != nullptr && *kind == "delamination";
  const std::string* host = defect.text(delamination ? "below" : "layer");
  if (host == nullptr || removed.count(*host) > 0) {
    return host != nullptr;
  }
  if (delamination) {
    for (std::size_t i = 0; i + 1 < layers.size(); ++i) {
      if (name_of(layers[i]) == *host) {
        return removed.count(name_of(layers[i + 1])) > 0;
      }
    }
  }
  return false;
}

// A change to a layer the variant removes, or to a defect that goes with
// it, would be silently lost: it is a mistake in the variant.
void check_changes_kept(
    const CaseDocument& document,
    const std::vector<std::pair<const SetChange*, casefile::ChangeTarget>>& targets,
    const std::set<std::string>& removed, const std::string& set_path) {
  casefile::Problems problems;
  for (const auto& [change, target] : targets) {
    const std::string key = set_path + "." + echoed(change->path);
    if (target.section == CaseSection::layer &&
        removed.count(name_of(document.layers[target.index])) > 0) {
      problems.add(change->where, key,
                   "expected a layer the variant keeps, found \"" +
                       name_of(document.layers[target.index]) + "\", which it removes");
    } else if (target.section == CaseSection::defect &&
               loses_defect(document.defects[target.index], document.layers, removed)) {
      problems.add(change->where, key,
                   "expected a defect the variant keeps, found one that goes with a layer it "
                   "removes");
    }
  }
  problems.throw_if_any();
}

CaseSpec apply(const CaseSpec& base, const std::vector<SetChange>& changes,
               const std::vector<Located<std::string>>& remove, const std::string& run_name,
               const std::string& context) {
  CaseDocument document = casefile::document_from_case(base, false, false);
  casefile::Problems problems;
  bool sets_out = false;
  std::vector<std::pair<const SetChange*, casefile::ChangeTarget>> targets;
  for (const SetChange& change : changes) {
    std::string problem;
    const std::optional<casefile::ChangeTarget> target =
        casefile::resolve_change_path(change.path, document, problem);
    if (!target) {
      problems.add(change.where, context, problem);
      continue;
    }
    casefile::target_table(document, *target).entries[std::string(target->key->name)] =
        casefile::Entry{change.value, change.where, false, true};
    sets_out = sets_out || change.path == "report.out";
    targets.emplace_back(&change, *target);
  }
  problems.throw_if_any();
  drop_inapplicable(document);

  std::set<std::string> removed;
  for (const Located<std::string>& name : remove) {
    removed.insert(name.value);
  }
  check_changes_kept(document, targets, removed, "variant." + run_name + ".set");
  std::erase_if(document.defects, [&](const Table& defect) {
    return loses_defect(defect, document.layers, removed);
  });
  std::erase_if(document.layers,
                [&removed](const Table& layer) { return removed.count(name_of(layer)) > 0; });

  CaseSpec spec;
  try {
    spec = casefile::build_case(document, base.library);
  } catch (const InputError& error) {
    std::vector<InputProblem> located = error.problems();
    for (InputProblem& problem : located) {
      problem.message += " (in " + context + ")";
    }
    throw InputError(located, error.not_listed());
  }
  if (!sets_out) {
    spec.report.out = {base.report.out.value / run_name, base.report.out.where, true};
  }
  return spec;
}

}  // namespace

std::vector<ResolvedCase> resolve_variants(const CaseSpec& base) {
  std::vector<ResolvedCase> resolved;
  for (const VariantSpec& variant : base.variants) {
    std::string description;
    for (const Located<std::string>& name : variant.remove) {
      description += (description.empty() ? "remove " : ", ") + name.value;
    }
    for (const SetChange& change : variant.set) {
      description += (description.empty() ? "set " : "; set ") + change.path + " = " +
                     case_value_text(change.value);
    }
    resolved.push_back(ResolvedCase{
        variant.name.value, description.empty() ? "no change" : description,
        apply(base, variant.set, variant.remove, variant.name.value,
              "variant \"" + variant.name.value + "\"")});
  }
  return resolved;
}

std::vector<ResolvedCase> resolve_sweep(const CaseSpec& base) {
  std::vector<ResolvedCase> resolved;
  if (!base.sweep) {
    return resolved;
  }
  for (std::size_t i = 0; i < base.sweep->values.size(); ++i) {
    const SetChange& change = base.sweep->values[i];
    const std::string name = "sweep-" + std::to_string(i + 1);
    resolved.push_back(
        ResolvedCase{name, change.path + " = " + case_value_text(change.value),
                     apply(base, {change}, {}, name,
                           "sweep value " + std::to_string(i + 1) + " (" + echoed(change.path) +
                               " = " + echoed(case_value_text(change.value)) + ")")});
  }
  return resolved;
}

}  // namespace plystrain
