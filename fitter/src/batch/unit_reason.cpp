#include "ridgecal/unit_reason.hpp"

#include <cmath>
#include <map>
#include <stdexcept>
#include <utility>

namespace ridgecal {

namespace {
constexpr std::pair<UnitReason, const char*> kReasonNames[] = {
    {UnitReason::None, "none"},
    {UnitReason::NotJudged, "not-judged"},
    {UnitReason::Stuck, "stuck"},
    {UnitReason::OpenOrShort, "open-or-short"},
    {UnitReason::Saturated, "saturated"},
    {UnitReason::MissingCells, "missing-cells"},
    {UnitReason::BadInput, "bad-input"},
    {UnitReason::FitFailed, "fit-failed"},
    {UnitReason::Outlier, "outlier"},
    {UnitReason::Hysteresis, "hysteresis"},
    {UnitReason::Drift, "drift"},
    {UnitReason::LackOfFit, "lack-of-fit"},
    {UnitReason::OutOfTolerance, "out-of-tolerance"},
    {UnitReason::InadequateModel, "inadequate-model"},
    {UnitReason::Undecided, "undecided"},
};

bool has_warning(const CalibrationRecord& rec, DiagnosticCode code) {
  for (const Warning& w : rec.warnings)
    if (w.code == code) return true;
  return false;
}
}  // namespace

std::string to_string(UnitReason r) {
  for (const auto& [reason, name] : kReasonNames)
    if (reason == r) return name;
  return "bad-input";
}

UnitReason unit_reason_from_string(const std::string& s) {
  for (const auto& [reason, name] : kReasonNames)
    if (s == name) return reason;
  throw std::invalid_argument("unknown unit reason '" + s + "'");
}

UnitReason reason_for_input(InputCause cause) {
  switch (cause) {
    case InputCause::EmptyCell:
      return UnitReason::MissingCells;
    case InputCause::ConstantReadings:
    case InputCause::FrozenReadings:
      return UnitReason::Stuck;
    case InputCause::ZeroReadings:
      return UnitReason::OpenOrShort;
    case InputCause::ClippedReadings:
      return UnitReason::Saturated;
    case InputCause::Other:
      break;
  }
  return UnitReason::BadInput;
}

WorstPoint worst_point(const CalibrationRecord& rec) {
  const Calibration& cal = rec.calibration;
  std::map<std::size_t, const PointResult*> by_line;
  for (const PointResult& p : cal.points) by_line.emplace(p.line, &p);
  auto label = [&](std::size_t line) {
    const auto it = by_line.find(line);
    return it == by_line.end() ? std::string() : it->second->setpoint;
  };
  WorstPoint w;
  if (rec.decision) {
    std::map<std::string, bool> counts;
    for (const SetJudgement& s : rec.decision->sets) counts[s.name] = s.counts;
    double best = -1.0;
    for (const PointJudgement& p : rec.decision->points) {
      const auto it = counts.find(p.set);
      if (it != counts.end() && !it->second) continue;
      if (!(p.limit > 0.0) || !std::isfinite(p.error)) continue;
      const double ratio = std::fabs(p.error) / p.limit;
      if (ratio > best) {
        best = ratio;
        w.setpoint = label(p.line);
        w.ratio = ratio;
        w.excess = std::fabs(p.error) - p.limit;
      }
    }
    return w;
  }
  double best = -1.0;
  for (const PointResult& p : cal.points)
    if (std::isfinite(p.error) && std::fabs(p.error) > best) {
      best = std::fabs(p.error);
      w.setpoint = p.setpoint;
    }
  return w;
}

UnitReason reason_for_record(const CalibrationRecord& rec) {
  if (!rec.decision) return UnitReason::NotJudged;
  const Decision& d = *rec.decision;
  switch (d.verdict) {
    case Verdict::Pass:
      return UnitReason::None;
    case Verdict::Undecided:
      return d.adequacy.far && !d.adequacy.overridden ? UnitReason::InadequateModel
                                                      : UnitReason::Undecided;
    case Verdict::Fail:
      break;
  }
  const std::pair<DiagnosticCode, UnitReason> causes[] = {
      {DiagnosticCode::Outlier, UnitReason::Outlier},
      {DiagnosticCode::Hysteresis, UnitReason::Hysteresis},
      {DiagnosticCode::DriftBetweenRepeats, UnitReason::Drift},
      {DiagnosticCode::LackOfFit, UnitReason::LackOfFit},
  };
  for (const auto& [code, reason] : causes)
    if (has_warning(rec, code)) return reason;
  return UnitReason::OutOfTolerance;
}

}  // namespace ridgecal
