// ridgecal report (internal): the parts of a calibration record as the report
// draws and tabulates them, built once from the parsed record, and the shared
// helpers of the section and figure files.
#pragma once

#include <fmt/format.h>

#include <limits>
#include <string>
#include <vector>

#include "model_view.hpp"
#include "ridgecal/record.hpp"
#include "ridgecal/report/html_report.hpp"
#include "ridgecal/report/svg_plot.hpp"

namespace ridgecal::report::detail {

inline constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

std::string esc(const std::string& s);
std::string lower(std::string s);
std::string upper(std::string s);

struct Units {
  std::string reading, reference;
  std::string reading_sfx() const { return reading.empty() ? "" : " " + reading; }
  std::string reference_sfx() const { return reference.empty() ? "" : " " + reference; }
};

struct Point {
  double reading = kNaN, reference = kNaN, predicted = kNaN, cv_predicted = kNaN;
  double aux = kNaN;  // second input of an extended fit
  std::string role;   // "train" or "test"
};

struct ToleranceView {
  bool present = false;
  // limit(r) = offset + proportional*|r| + percent_of_span/100*span: the record's formula.
  bool readable = false;
  double offset = 0, proportional = 0, percent_of_span = 0, span = 0;
  std::string text;  // HTML, as shown to the reviewer
  double limit(double r) const;
  bool constant() const { return proportional == 0.0; }
};

struct DecisionView {
  bool present = false;
  std::string verdict;  // PASS / FAIL / UNDECIDED
  std::string rule, detail;
  std::vector<std::string> set_lines;      // one line per judged set
  std::vector<double> fail_ref, fail_err;  // points that do not conform
  std::vector<double> acc_ref, acc_limit;  // guarded rule: acceptance limit per point
};

struct UncertaintyView {
  bool present = false;
  double expanded = kNaN, k = kNaN;
  // Band of half-widths along the reference axis; empty = constant +-expanded.
  std::vector<double> band_x, band_u;
};

/// Everything the sections and figures read, built once per report.
struct ReportData {
  const CalibrationRecord& rec;
  const RecordSeal& seal;
  Units units;
  std::vector<Point> points;
  ModelView model;
  std::string aux_name;  // column of the second input, as recorded ("aux" when unnamed)
  ToleranceView tolerance;
  DecisionView decision;
  UncertaintyView uncertainty;

  ReportData(const CalibrationRecord& r, const RecordSeal& s);
};

/// The HTML being written.
struct Builder {
  std::string o;
  void open_section(const char* id, const std::string& title) {
    o += fmt::format("<section id=\"{}\">\n<h2>{}</h2>\n", id, title);
  }
  void close_section() { o += "</section>\n"; }
};

// Series styles shared by the figures. Shapes and fills differ, so grey print keeps them apart.
extern const SeriesStyle kTrainStyle, kValidationStyle, kTestStyle;
extern const char* const kDegreeColors[8];
extern const Marker kDegreeMarkers[8];
extern const char* const kDegreeDashes[8];

/// The page's style sheet (page_styles.cpp).
const char* page_css();

// Sections (report_sections.cpp, model_section.cpp), in reading order.
void header_section(Builder& b, const ReportData& d, const ReportOptions& opt);
void verdict_section(Builder& b, const ReportData& d);
/// Rows of the per-point table at most (a million-row run would make the page useless).
inline constexpr std::size_t kMaxPointRows = 2000;
void points_section(Builder& b, const ReportData& d);
void metrics_section(Builder& b, const ReportData& d);
void warnings_section(Builder& b, const ReportData& d);
void model_section(Builder& b, const ReportData& d);
void split_section(Builder& b, const ReportData& d);
void cautions_section(Builder& b, const ReportData& d);
void signoff_section(Builder& b);

// Figures (figures_fit.cpp, figures_residuals.cpp, figure_validation.cpp).
void fit_figure(Builder& b, const ReportData& d);
void error_figure(Builder& b, const ReportData& d);
/// The residual views of extended records, numbered from `fig`; returns the next number.
int surface_figures(Builder& b, const ReportData& d, int fig);
void validation_figure(Builder& b, const ReportData& d, int fig);

}  // namespace ridgecal::report::detail
