// Writers of a run's result files (results-format.md, version 1):
// results.json, summary.txt (the terminal table) and profiles.csv. Each
// `*_text` function returns the file's contents; each `write_*` function
// writes them whole-or-nothing (temporary file beside, then rename).
//
// Lengths inside RunResults are micrometres; the files give them in the
// case's own unit, so every writer takes the unit the case was written in.
#pragma once

#include "plystrain/solver/results.hpp"

#include <filesystem>
#include <string>
#include <vector>

namespace plystrain {

// The case's length unit for output: its name ("um", "mm", ...) and how many
// micrometres one unit is. A length of L um is written as L / length_scale.
struct OutputUnit {
  std::string name = "um";
  double length_scale = 1.0;  // micrometres per case unit
};

// The cautions every report carries: results are model estimates that defer
// to physical testing, the applicable standards and qualified review; body-
// worn products need their own safety and biocompatibility evaluation.
[[nodiscard]] std::vector<std::string> standard_cautions();

// `run.cautions` followed by every standard caution it does not already
// contain: what the files list under "cautions".
[[nodiscard]] std::vector<std::string> cautions_to_report(const RunResults& run);

// results.json. Absent optionals and non-finite numbers are null (JSON has
// no NaN); doubles are written in shortest round-trip form.
[[nodiscard]] std::string results_json_text(const RunResults& run, const OutputUnit& unit);
void write_results_json(const std::filesystem::path& path, const RunResults& run,
                        const OutputUnit& unit);

// What the terminal shows and summary.txt holds: the headline first; per
// result a verdict table (peak strain %, concentration, min strain, crack
// and yield margins, the share of the load at first crack and first yield,
// verdict) and a detail table (where, far field, peak stress, crack onset
// and yield strains, basis); a line naming every layer expected to crack
// (the governing verdict over global and local checks); a line saying the
// run completed, or why it stopped and the load reached; then the cautions.
// Plain text, no terminal escape codes.
[[nodiscard]] std::string format_results_table(const RunResults& run, const OutputUnit& unit);
void write_summary_text(const std::filesystem::path& path, const RunResults& run,
                        const OutputUnit& unit);

// Shortest text that reads back as exactly `value` ("nan", "inf", "-inf"
// for non-finite values), for CSV output.
[[nodiscard]] std::string round_trip_number(double value);

// A CSV field: as is, or quoted (RFC 4180) when it holds a comma, quote or
// line break.
[[nodiscard]] std::string csv_field(const std::string& text);

// profiles.csv: header `layer,x,z,strain_along,strain_across,strain_third,
// max_principal`, one row per sample. Layer names containing a comma, quote
// or line break are quoted as RFC 4180 describes.
[[nodiscard]] std::string profiles_csv_text(const std::vector<ProfileSample>& samples,
                                            const OutputUnit& unit);
void write_profiles_csv(const std::filesystem::path& path,
                        const std::vector<ProfileSample>& samples, const OutputUnit& unit);

}  // namespace plystrain
