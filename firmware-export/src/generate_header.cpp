// generate_header(): the one C header writer for every model. Checks the
// input, runs the export proof of the numeric mode, writes the header from
// its pieces (header_writer.hpp) and applies the refusal rule. The contract
// of the text is docs/firmware-export.md.
#include <algorithm>
#include <cmath>
#include <sstream>
#include <type_traits>

#include "header_writer.hpp"
#include "ridgecal/firmware/c_text.hpp"
#include "ridgecal/firmware/crc_table.hpp"
#include "ridgecal/firmware/export.hpp"

namespace ridgecal::firmware {

namespace {

using detail::g;

// Why the export cannot start ("" when it can).
std::string input_problem(const FirmwareModel& model, const ExportOptions& opt) {
  if (std::string m = opt.validate(); !m.empty()) return m;
  if (!model.problem.empty()) return model.problem;
  if (model.inputs.empty() || model.monomial.empty() || !model.reference || !model.reference_fitted)
    return "model: no coefficients or no reference model (make it with firmware_model())";
  if (opt.mode == NumericMode::Fixed && !model.transforms.identity())
    return "fixed point: the model has transforms (" + model.transforms.describe() +
           "); the integer-only header supports the plain polynomial in (reading, aux) only -- "
           "use --numeric float or --numeric double";
  return "";
}

// The float/double part: every basis the model offers is emulated (the
// one-input header also offers the raw reading x); the one with the smaller
// max deviation is written. False, with r.message set, when none fits T.
template <typename T>
bool write_floating(detail::HeaderContext& c, std::ostringstream& body, ExportResult& r,
                    std::uint32_t& crc) {
  constexpr bool is_float = std::is_same_v<T, float>;
  const char* type = is_float ? "float" : "double";
  const detail::ProofGrid grid = detail::proof_grid(c.model, c.opt);
  std::optional<FloatingProgram<T>> best;
  for (Basis b : {Basis::ScaledT, Basis::RawX}) {
    const auto p = detail::make_program<T>(c.model, b);
    if (!p) continue;
    const detail::Deviation d = detail::measure(c.model, *p, grid, c.meta);
    if (!best || d.max < c.dev.max) {
      best = p;
      c.dev = d;
    }
  }
  if (!best) {
    r.message = std::string("model: a ") + (c.d.extended ? "constant" : "coefficient") +
                " does not fit in " + type;
    return false;
  }
  const FloatingProgram<T>& p = *best;
  const std::string fmt = is_float ? "IEEE binary32" : "IEEE binary64";
  if (c.d.extended)
    c.formats =
        fmt + ", nested Horner in scaled t" + (p.has_aux ? ", s" : "") +
        (c.needs_log ? std::string(", ln by ") + (is_float ? "logf" : "log") + " (C library)" : "");
  else
    c.formats =
        fmt + ", Horner in " +
        (p.basis == Basis::ScaledT ? "scaled t = (x - c) * s (chosen: lower error than raw x)"
                                   : "raw x (chosen: lower error than scaled t)");
  detail::emit_floating(body, c, p);
  crc = detail::checked_crc32(c.checked);
  detail::emit_crc(body, c, !is_float);
  // operations: the Horner steps, the scaling of each input, the transforms
  const int K = p.reading_degree, L = p.aux_degree;
  const int steps = (K + 1) * L + K + (p.basis == Basis::ScaledT ? 1 : 0) + (p.has_aux ? 1 : 0) +
                    (p.reciprocal_kelvin ? 1 : 0);
  const int divider = p.divider ? 1 : 0;
  r.stats =
      detail::stats_for("", (K + 1) * (L + 1), sizeof(T), steps + 2 * divider, steps + divider);
  r.basis = p.basis;
  if constexpr (is_float)
    r.float_program = p;
  else
    r.double_program = p;
  return true;
}

// The fixed-point part. False, with r.message set, when no plan is proved.
bool write_fixed(detail::HeaderContext& c, std::ostringstream& body, ExportResult& r,
                 std::uint32_t& crc) {
  FixedPlan plan;
  std::string why;
  if (!plan_fixed(c.model, c.opt, &plan, &why)) {
    r.message = "fixed point: " + why;
    return false;
  }
  c.dev = detail::measure(c.model, plan, detail::proof_grid(c.model, c.opt), c.meta);
  const std::string tail =
      ", int64 intermediates, output = round(y * " + g(plan.output_scale, 9) + ") int32";
  if (c.d.extended) {
    c.formats = "int32 coefficients (Q per entry), t in Q" + std::to_string(plan.t.frac) +
                (plan.has_aux ? ", s in Q" + std::to_string(plan.s.frac) : std::string()) + tail;
  } else {
    std::string qs;
    for (std::size_t k = 0; k < plan.q.size(); ++k)
      qs += (k ? "," : "") + std::to_string(plan.q[k]);
    c.formats =
        "int32 coefficients Q[" + qs + "] (t^0..t^n), t in Q" + std::to_string(plan.t.frac) + tail;
  }
  detail::emit_fixed(body, c, plan);
  crc = detail::checked_crc32(c.checked);
  detail::emit_crc(body, c, false);
  const int K = plan.reading_degree, L = plan.aux_degree, axes = plan.has_aux ? 2 : 1;
  const int ops = (K + 1) * L + K;
  r.stats = detail::stats_for("", (K + 1) * (L + 1), 4, ops + axes, 2 * ops + 2 * axes);
  r.fixed_plan = plan;
  return true;
}

}  // namespace

ExportResult generate_header(const FirmwareModel& model, const HeaderMeta& meta,
                             const ExportOptions& opt) {
  ExportResult r;
  r.status = ExportStatus::InvalidInput;
  if (std::string m = input_problem(model, opt); !m.empty()) {
    r.message = m;
    return r;
  }
  detail::ProofTolerance tol;
  if (!detail::choose_proof_tolerance(meta, opt, tol, r.message)) return r;
  r.tolerance_used = tol.tolerance;
  r.tolerance_source = tol.source;
  r.deviation_limit = tol.limit;

  const detail::Names n{opt.prefix, macro_case(opt.prefix)};
  detail::HeaderContext c{model,
                          meta,
                          opt,
                          n,
                          detail::dialect(model, n),
                          tol,
                          {},
                          "",
                          false,
                          detail::esc(meta.reading_unit, 40),
                          detail::esc(meta.reference_unit, 40),
                          detail::esc(meta.aux_unit, 40),
                          {}};
  c.needs_log = model.transforms.reading == ReadingTransform::Ln && opt.mode != NumericMode::Fixed;
  std::ostringstream body;
  std::uint32_t crc = 0;
  const bool ok = opt.mode == NumericMode::Float    ? write_floating<float>(c, body, r, crc)
                  : opt.mode == NumericMode::Double ? write_floating<double>(c, body, r, crc)
                                                    : write_fixed(c, body, r, crc);
  if (!ok) return r;
  const detail::Deviation& dev = c.dev;

  // after "at reading <value>": the unit (fixed: and the raw value), or the aux value
  std::string at;
  if (c.d.extended)
    at = model.has_aux() ? ", aux " + g(dev.at_aux, 9) : std::string();
  else
    at = " " + c.ru + (r.fixed_plan ? " (raw " + g(dev.at * r.fixed_plan->t.scale, 10) + ")" : "");
  std::ostringstream o;
  detail::emit_banner(o, c, at);
  detail::emit_prologue(o, c, crc);
  o << body.str();
  detail::emit_epilogue(o, n);

  r.header = o.str();
  r.table_crc32 = crc;
  r.formats = c.formats;
  r.max_deviation = dev.max;
  r.deviation_at = dev.at;
  r.deviation_at_aux = dev.at_aux;
  r.libm_allowance = dev.allowance;
  r.points_checked = dev.points;
  r.readings_checked = dev.readings;
  const CodeStats partial = r.stats;
  r.stats = detail::stats_for(r.header, partial.table_entries,
                              partial.table_bytes / std::max(1, partial.table_entries),
                              partial.multiplies_per_eval, partial.additions_per_eval);

  const std::string where = " at reading " + g(dev.at, 9) +
                            (model.has_aux() ? ", aux " + g(dev.at_aux, 9) : std::string());
  if (!(dev.max + dev.allowance <= tol.limit)) {
    r.status = ExportStatus::Refused;
    r.message = "refused: max deviation " + g(dev.max, 4) + where +
                (c.needs_log ? " (+ log() allowance " + g(dev.allowance, 3) + ")" : std::string()) +
                " exceeds " + g(opt.max_deviation_fraction) + " x tolerance (" + g(tol.tolerance) +
                ", " + tol.source + ") = " + g(tol.limit, 4) + " in " + to_string(opt.mode) +
                " mode";
    return r;
  }
  r.status = ExportStatus::Ok;
  r.message = to_string(opt.mode) + " header" + (c.d.extended ? " (extended model)" : "") +
              ": max deviation " + g(dev.max, 4) +
              (c.needs_log ? " + log() allowance " + g(dev.allowance, 3) : std::string()) +
              " <= " + g(tol.limit, 4) + " over " + std::to_string(dev.points) + " inputs";
  return r;
}

}  // namespace ridgecal::firmware
