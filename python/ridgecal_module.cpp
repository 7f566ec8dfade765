// The Python module `ridgecal` (pybind11) over the C++ library: fit, verify,
// firmware header and report, with the CLI's option names and validation
// (the keyword options are turned into the CLI's arguments and parsed by the
// CLI's own parser) and the CLI's error messages. See docs/python.md.
#include <fmt/format.h>
#include <pybind11/numpy.h>
#include <pybind11/pybind11.h>
#include <pybind11/stl.h>

#include <fstream>
#include <sstream>

#include "cli_common.hpp"
#include "fit_command.hpp"
#include "record_header.hpp"
#include "ridgecal/as_found.hpp"
#include "ridgecal/calibrate.hpp"
#include "ridgecal/errors.hpp"
#include "ridgecal/record.hpp"
#include "ridgecal/record_guard.hpp"
#include "ridgecal/report/html_report.hpp"
#include "verify_command.hpp"

namespace py = pybind11;
using namespace ridgecal;

namespace {

/// Name of the data in messages and in the record's provenance for fit() from arrays.
constexpr const char* kArraysSource = "<arrays>";

/// `ridgecal export` would refuse this header (exit 1): not PASS, or too inexact.
class HeaderRefused : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

/// A record made or read by the module: its JSON text is the source of truth
/// (the same bytes the CLI writes), the parsed record serves the methods.
struct PyRecord {
  std::string text;  ///< record_text(json): byte-identical to the CLI's record file
  GuardedRecord guarded;
};

PyRecord make_record(const nlohmann::json& j, const std::string& source) {
  PyRecord r;
  py::gil_scoped_release release;  // pure C++: serialise, digest, parse back
  r.text = record_text(j);
  r.guarded = check_record_text(r.text, source, false);
  return r;
}

/// Python keyword options -> the CLI's arguments: name_with_underscores=value
/// -> --name-with-dashes VALUE; True -> a switch, False/None -> omitted.
std::vector<std::string> options_to_args(const py::kwargs& options,
                                         const std::vector<std::string>& refused,
                                         const char* function) {
  std::vector<std::string> args;
  for (const auto& item : options) {
    std::string name = py::str(item.first).cast<std::string>();
    if (std::find(refused.begin(), refused.end(), name) != refused.end())
      throw cli::UsageError(fmt::format("{}(): option '{}' does not apply here", function, name));
    for (char& c : name)
      if (c == '_') c = '-';
    const py::handle v = item.second;
    if (v.is_none()) continue;
    if (py::isinstance<py::bool_>(v)) {
      if (v.cast<bool>()) args.push_back("--" + name);
      continue;
    }
    args.push_back("--" + name);
    args.push_back(py::str(v).cast<std::string>());
  }
  return args;
}

PyRecord run_fit(const Dataset& data, const cli::FitCommand& cmd) {
  CalibrateOptions options;
  options.fit = cmd.fit;
  options.comp = cmd.comp;
  options.assess = cmd.assess;
  options.sensor = cmd.sensor;
  options.created_utc = cli::creation_time(cmd.timestamp);
  nlohmann::json j;
  {
    py::gil_scoped_release release;  // fits from several threads run in parallel
    const CalibrateResult result = calibrate(data, options);
    if (!result.status.ok)
      throw InputError(data.file, 0, result.status.message, "see 'ridgecal fit --help'");
    j = record_to_json(result.record);
  }
  return make_record(j, data.file);
}

PyRecord fit_csv(const std::string& path, const py::kwargs& options) {
  std::vector<std::string> args =
      options_to_args(options, {"output", "report", "help", "full"}, "fit_csv");
  args.insert(args.begin(), path);
  const cli::FitCommand cmd = cli::parse_fit_command(args);
  Dataset data;
  {
    py::gil_scoped_release release;
    data = read_calibration_csv(cmd.data_path, cmd.csv);
  }
  return run_fit(data, cmd);
}

using Vector = py::array_t<double, py::array::c_style | py::array::forcecast>;

/// A 1-D float64 array of `n` values (n = -1: any), or a clear TypeError/ValueError.
Vector as_vector(const py::handle& h, const char* name, py::ssize_t n) {
  py::array a = py::array::ensure(h);
  if (!a)
    throw py::type_error(fmt::format("{}: expected a 1-D array or sequence of numbers", name));
  const char kind = a.dtype().kind();
  if (kind != 'f' && kind != 'i' && kind != 'u')
    throw py::type_error(fmt::format("{}: dtype {} is not numeric; give float or integer values",
                                     name, std::string(py::str(a.dtype()))));
  if (a.ndim() != 1)
    throw py::value_error(
        fmt::format("{}: expected a 1-D array, got {} dimensions", name, a.ndim()));
  if (n >= 0 && a.shape(0) != n)
    throw py::value_error(
        fmt::format("{}: length {} differs from reading's length {}", name, a.shape(0), n));
  return Vector::ensure(a);
}

/// The arrays as CSV text for the CLI's reader, so that they meet the same
/// checks (NaN, infinities, magnitudes, limits) with the same messages. "{}"
/// prints the shortest text that reads back to the same double.
std::string arrays_to_csv(const Vector& x, const Vector& y,
                          const std::vector<std::string>& setpoints, const Vector* aux) {
  std::string text = "reading,reference";
  if (!setpoints.empty()) text += ",setpoint";
  if (aux) text += ",aux";
  text += "\n";
  for (py::ssize_t i = 0; i < x.shape(0); ++i) {
    text += fmt::format("{},{}", x.at(i), y.at(i));
    if (!setpoints.empty()) {
      text += ",\"";
      for (char c : setpoints[static_cast<std::size_t>(i)])
        text += c == '"' ? "\"\"" : std::string(1, c);
      text += "\"";
    }
    if (aux) text += fmt::format(",{}", aux->at(i));
    text += "\n";
  }
  return text;
}

PyRecord fit_arrays(const py::handle& reading, const py::handle& reference,
                    const py::handle& setpoint, const py::handle& aux, const py::kwargs& options) {
  const Vector x = as_vector(reading, "reading", -1);
  const Vector y = as_vector(reference, "reference", x.shape(0));
  std::vector<std::string> setpoints;
  if (!setpoint.is_none()) {
    for (const auto& s : setpoint) setpoints.push_back(py::str(s).cast<std::string>());
    if (static_cast<py::ssize_t>(setpoints.size()) != x.shape(0))
      throw py::value_error(fmt::format("setpoint: length {} differs from reading's length {}",
                                        setpoints.size(), x.shape(0)));
  }
  Vector a;
  if (!aux.is_none()) a = as_vector(aux, "aux", x.shape(0));
  std::vector<std::string> args =
      options_to_args(options,
                      {"output", "report", "help", "full", "reading", "reference", "setpoint",
                       "aux", "role", "direction", "delimiter", "decimal_comma", "aux_setpoint"},
                      "fit");
  args.insert(args.begin(), kArraysSource);
  if (!setpoint.is_none()) args.insert(args.end(), {"--setpoint", "setpoint"});
  if (!aux.is_none()) args.insert(args.end(), {"--aux", "aux"});
  cli::FitCommand cmd;
  std::string text;
  Dataset data;
  {
    py::gil_scoped_release release;  // C++ only from here to the fit
    cmd = cli::parse_fit_command(args);
    text = arrays_to_csv(x, y, setpoints, aux.is_none() ? nullptr : &a);
    data = parse_calibration_csv(text, kArraysSource, cmd.csv);
  }
  return run_fit(data, cmd);
}

py::object json_loads(const std::string& text) {
  return py::module_::import("json").attr("loads")(text);
}

Vector predict(const PyRecord& r, const py::handle& x, const py::handle& aux) {
  const Vector xs = as_vector(x, "x", -1);
  Vector as;
  if (!aux.is_none()) as = as_vector(aux, "aux", xs.shape(0));
  Vector out(xs.shape(0));
  const Model& m = general_model(r.guarded.record.calibration);
  if (m.has_aux && aux.is_none())
    throw py::value_error("aux: this record's model has a second input; give aux= as well");
  for (py::ssize_t i = 0; i < xs.shape(0); ++i)
    out.mutable_at(i) = m.eval(xs.at(i), aux.is_none() ? 0.0 : as.at(i));
  return out;
}

std::string header(const PyRecord& r, const std::string& prefix, const std::string& numeric,
                   bool allow_unpassed) {
  cli::RecordHeaderRequest request;
  request.options.prefix = prefix;
  const auto m = firmware::numeric_mode_from_string(numeric);
  if (!m)
    throw cli::UsageError(fmt::format("--numeric '{}': must be float, double or fixed", numeric));
  request.options.mode = *m;
  if (const std::string e = request.options.validate(); !e.empty()) throw cli::UsageError(e);
  request.allow_unpassed = allow_unpassed;
  const cli::RecordHeaderResult made =
      cli::make_record_header(r.guarded, r.guarded.record.input.file, request);
  if (made.status != cli::RecordHeaderStatus::Written) throw HeaderRefused(made.refusal);
  return made.exported.header;
}

}  // namespace

PYBIND11_MODULE(ridgecal, mod) {
  mod.doc() = "ridgecal: sensor calibration (fit, verdict, firmware header) from Python";
  static py::exception<InputError> input_error(mod, "InputError", PyExc_ValueError);
  static py::exception<cli::UsageError> usage_error(mod, "UsageError", PyExc_ValueError);
  py::register_exception<HeaderRefused>(mod, "RefusedError", PyExc_RuntimeError);
  py::register_exception_translator([](std::exception_ptr p) {
    try {
      if (p) std::rethrow_exception(p);
    } catch (const InputError& e) {
      input_error(format_input_error(e).c_str());
    } catch (const cli::UsageError& e) {
      usage_error(e.what());
    }
  });
  mod.attr("__version__") = tool_version();

  py::class_<PyRecord>(mod, "Record")
      .def(
          "to_json", [](const PyRecord& r) { return r.text; },
          "The record's JSON text, byte-identical to the file `ridgecal fit -o` writes")
      .def_static(
          "from_json",
          [](const std::string& text, const std::string& source) {
            PyRecord r;
            r.text = text;
            r.guarded = check_record_text(text, source, false);
            return r;
          },
          py::arg("text"), py::arg("source") = "<record>",
          "Reads a record, refusing one whose integrity digest does not match (as the CLI)")
      .def_property_readonly(
          "model", [](const PyRecord& r) -> py::object { return json_loads(r.text)["model"]; })
      .def_property_readonly(
          "metrics", [](const PyRecord& r) -> py::object { return json_loads(r.text)["metrics"]; })
      .def_property_readonly(
          "points", [](const PyRecord& r) -> py::object { return json_loads(r.text)["points"]; })
      .def_property_readonly("decision",
                             [](const PyRecord& r) -> py::object {
                               const py::dict d = json_loads(r.text);
                               return d.contains("decision") ? py::object(d["decision"])
                                                             : py::none();
                             })
      .def_property_readonly("verdict",
                             [](const PyRecord& r) -> py::object {
                               const auto& d = r.guarded.record.decision;
                               return d ? py::object(py::str(to_string(d->verdict))) : py::none();
                             })
      .def("as_dict", [](const PyRecord& r) { return json_loads(r.text); })
      .def("predict", &predict, py::arg("x"), py::arg("aux") = py::none())
      .def("header", &header, py::arg("prefix"), py::arg("numeric") = "float",
           py::arg("allow_unpassed") = false)
      .def("report_html", [](const PyRecord& r) {
        return report::render_html_report(r.guarded.record, r.guarded.seal);
      });

  mod.def("fit", &fit_arrays, py::arg("reading"), py::arg("reference"),
          py::arg("setpoint") = py::none(), py::arg("aux") = py::none());
  mod.def("fit_csv", &fit_csv, py::arg("path"));
  mod.def(
      "verify",
      [](const PyRecord& r, const py::handle& reading, const py::handle& reference,
         const py::handle& setpoint, const py::kwargs& options) {
        // The CLI's parser checks the judgement options (tolerance, decision rule).
        std::vector<std::string> args =
            options_to_args(options,
                            {"output", "help", "full", "reading", "reference", "setpoint",
                             "delimiter", "allow_modified"},
                            "verify");
        args.insert(args.begin(), {"<record>", kArraysSource});
        const cli::VerifyCommand cmd = cli::parse_verify_command(args);
        const Vector x = as_vector(reading, "reading", -1);
        const Vector y = as_vector(reference, "reference", x.shape(0));
        std::vector<std::string> sp;
        if (!setpoint.is_none())
          for (const auto& s : setpoint) sp.push_back(py::str(s).cast<std::string>());
        if (!setpoint.is_none() && static_cast<py::ssize_t>(sp.size()) != x.shape(0))
          throw py::value_error(fmt::format("setpoint: length {} differs from reading's length {}",
                                            sp.size(), x.shape(0)));
        const std::string text = arrays_to_csv(x, y, sp, nullptr);
        CsvOptions csv;
        if (!sp.empty()) csv.setpoint_column = "setpoint";
        const Dataset data = parse_calibration_csv(text, kArraysSource, csv);
        CheckedRecord rec;
        rec.record = r.guarded.record;
        rec.file = "<record>";
        rec.digest = r.guarded.seal.computed;
        rec.integrity_ok = true;
        require_variation(data, cli::verify_variation_floors(rec.record.calibration), true);
        const AsFoundResult res = evaluate_as_found(rec, data, cmd.as_found);
        return json_loads(record_text(as_found_to_json(res, cli::creation_time(cmd.timestamp))));
      },
      py::arg("record"), py::arg("reading"), py::arg("reference"), py::arg("setpoint") = py::none(),
      "As-found check of a record on fresh readings (as `ridgecal verify`); returns the result");
}
