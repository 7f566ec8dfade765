// ridgecal report (internal): the validation curve: cross-validated and
// training RMSE against the ridge penalty, one curve per candidate term set.
#include <algorithm>
#include <cmath>
#include <map>

#include "report_data.hpp"
#include "ridgecal/report/number_format.hpp"

namespace ridgecal::report::detail {

namespace {

bool same_lambda(double a, double b) {
  if (a == b) return true;
  return std::fabs(a - b) <= 1e-9 * std::max(std::fabs(a), std::fabs(b));
}

}  // namespace

void validation_figure(Builder& b, const ReportData& d, int fig) {
  const SelectionInfo& sel = d.rec.calibration.selection;
  const Units& u = d.units;
  const std::vector<GridCell>& grid = sel.grid;
  b.o += "<figure id=\"fig-validation-figure\">\n";
  if (grid.empty()) {
    b.o += "<p class=\"missing\">No cross-validation grid in the record";
    b.o += " (selection mode: " + esc(to_string(sel.mode)) + ")";
    b.o += ": the validation curve cannot be drawn.</p>\n";
    b.o += fmt::format(
        "<figcaption><b>Figure {}.</b> Validation curve: not available.</figcaption>\n</figure>\n",
        fig);
    return;
  }
  // The chosen cell; without one, the final model's degree and penalty.
  const bool has_chosen = sel.chosen >= 0 && static_cast<std::size_t>(sel.chosen) < grid.size();
  const GridCell* chosen = has_chosen ? &grid[static_cast<std::size_t>(sel.chosen)] : nullptr;
  const int chosen_deg = chosen ? chosen->degree : d.model.degree;
  const double chosen_lam = chosen ? chosen->lambda : d.rec.calibration.lambda;
  const int chosen_aux = chosen ? chosen->aux_degree : -1;

  // One curve per candidate term set: the degree, and for extended fits with
  // separate limits the aux degree too.
  std::map<std::pair<int, int>, std::vector<GridCell>> by_degree;
  double ymin = kNaN, ymax = kNaN;
  for (const GridCell& c : grid) {
    by_degree[{c.degree, c.aux_degree}].push_back(c);
    for (double v : {c.cv_rmse, c.train_rmse, c.cv_rmse - c.cv_se, c.cv_rmse + c.cv_se})
      if (std::isfinite(v) && v > 0) {
        ymin = std::isfinite(ymin) ? std::min(ymin, v) : v;
        ymax = std::isfinite(ymax) ? std::max(ymax, v) : v;
      }
  }
  const bool log_y = std::isfinite(ymin) && ymax / ymin > 30.0;
  SvgPlot cv("fig-validation-cv", 340, 250), tr("fig-validation-train", 340, 250);
  cv.description = "Cross-validated RMSE against the ridge penalty, per degree";
  tr.description = "Training RMSE against the ridge penalty, per degree";
  for (SvgPlot* p : {&cv, &tr}) {
    p->x_axis.label = "ridge penalty \u03BB (log; 0 = none)";
    p->x_axis.scale = Scale::log;
    p->x_axis.zero_slot = true;
    p->y_axis.scale = log_y ? Scale::log : Scale::linear;
    if (std::isfinite(ymin)) {
      p->y_axis.min = log_y ? ymin : std::min(0.0, ymin);
      p->y_axis.max = ymax * (log_y ? 1.0 : 1.04);
      if (!log_y) p->y_axis.min.reset(), p->y_axis.include_zero = true;
    }
    p->show_legend = false;
  }
  cv.y_axis.label = "CV RMSE" + (u.reference.empty() ? "" : " [" + u.reference + "]");
  tr.y_axis.label = "training RMSE" + (u.reference.empty() ? "" : " [" + u.reference + "]");
  std::size_t k = 0;
  for (auto& [key, cells] : by_degree) {
    std::sort(cells.begin(), cells.end(),
              [](const GridCell& a, const GridCell& c) { return a.lambda < c.lambda; });
    Series s;
    s.name = key.second >= 0 ? fmt::format("degree {}, aux {}", key.first, key.second)
                             : fmt::format("degree {}", key.first);
    const bool dense = cells.size() > 12;  // many lambdas: smaller markers, thinner lines
    s.style = SeriesStyle{kDegreeColors[k % 8],  dense ? 1.2 : 1.6, kDegreeDashes[k % 8],
                          kDegreeMarkers[k % 8], k % 2 == 0,        dense ? 4.5 : 7.0};
    Series t = s;
    for (const GridCell& c : cells) {
      s.x.push_back(c.lambda);
      s.y.push_back(c.cv_rmse);
      s.y_err.push_back(c.cv_se);
      t.x.push_back(c.lambda);
      t.y.push_back(c.train_rmse);
    }
    cv.series.push_back(s);
    tr.series.push_back(t);
    ++k;
  }
  std::string chosen_text = "not identified";
  {
    for (const GridCell& c : grid) {
      if (c.degree == chosen_deg && same_lambda(c.lambda, chosen_lam) &&
          c.aux_degree == chosen_aux) {
        const std::string aux_text =
            c.aux_degree >= 0 ? fmt::format(", aux degree {}", c.aux_degree) : "";
        Series ring;
        ring.name = fmt::format("chosen: degree {}{}, \u03BB = {}", c.degree, aux_text,
                                format_lambda(c.lambda));
        ring.draw_line = false;
        ring.style = SeriesStyle{"#000000", 1.0, "", Marker::circle, false, 19.0};
        ring.x = {c.lambda};
        ring.y = {c.cv_rmse};
        // A hollow ring drawn over the chosen grid point (the point stays visible inside).
        cv.series.push_back(ring);
        ring.y = {c.train_rmse};
        tr.series.push_back(ring);
        chosen_text =
            fmt::format("degree {}{}, \u03BB = {} (CV RMSE {} \u00B1 {}, training RMSE {}{})",
                        c.degree, aux_text, format_lambda(c.lambda), format_sig(c.cv_rmse, 3),
                        format_sig(c.cv_se, 2), format_sig(c.train_rmse, 3), u.reference_sfx());
        break;
      }
    }
  }
  b.o += cv.render_legend(680) + "\n<div class=\"panels\">\n" + cv.render() + "\n" + tr.render() +
         "\n</div>\n";
  b.o += fmt::format("<figcaption><b>Figure {}.</b> Validation curve. Left", fig) +
         ": cross-validated RMSE (bars: \u00B1 one standard error "
         "over folds); right: training RMSE of the same candidates, on the same scale. "
         "\u03BB = 0 (no penalty) is drawn at the separate \u201C0\u201D position left of the "
         "break. Chosen: " +
         esc(chosen_text) + ".</figcaption>\n</figure>\n";
}

}  // namespace ridgecal::report::detail
