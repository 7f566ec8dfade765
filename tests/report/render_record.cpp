// Test helper: render a calibration record (JSON file) to a report file.
//   render_record IN.json OUT.html [--date TEXT] [--generator VERSION]
//   render_record --seal RECORD.json
//     rewrites integrity.sha256 of a hand-made fixture record with the digest
//     the fitter computes (ridgecal::record_digest), in place.
// Used by the golden-file and browser tests (and to refresh the golden file).
#include <fstream>
#include <iostream>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>

#include "ridgecal/errors.hpp"
#include "ridgecal/record.hpp"
#include "ridgecal/report/html_report.hpp"

int main(int argc, char** argv) {
  if (argc == 3 && std::string(argv[1]) == "--seal") {
    std::ifstream in(argv[2], std::ios::binary);
    nlohmann::json rec = nlohmann::json::parse(in);
    rec["integrity"] = {{"algorithm", "sha256"}, {"sha256", ridgecal::record_digest(rec)}};
    in.close();
    std::ofstream(argv[2], std::ios::binary) << rec.dump(1, ' ', false) << "\n";
    return 0;
  }
  if (argc < 3) {
    std::cerr << "usage: render_record IN.json OUT.html [--date TEXT] [--generator VERSION]\n";
    return 2;
  }
  ridgecal::report::ReportOptions opt;
  for (int i = 3; i + 1 < argc; i += 2) {
    const std::string k = argv[i];
    if (k == "--date")
      opt.date = argv[i + 1];
    else if (k == "--generator")
      opt.generator_version = argv[i + 1];
    else {
      std::cerr << "unknown option " << k << "\n";
      return 2;
    }
  }
  std::ifstream in(argv[1], std::ios::binary);
  if (!in) {
    std::cerr << "cannot read " << argv[1] << "\n";
    return 2;
  }
  try {
    // Read as every consumer reads a record: the record module's strict reader.
    const nlohmann::json rec = nlohmann::json::parse(in);
    const std::string html = ridgecal::report::render_html_report(
        ridgecal::record_from_json(rec, argv[1]), ridgecal::record_seal(rec), opt);
    std::ofstream out(argv[2], std::ios::binary);
    out << html;
    if (!out) {
      std::cerr << "cannot write " << argv[2] << "\n";
      return 1;
    }
  } catch (const ridgecal::InputError& e) {
    std::cerr << "render_record: " << e.file() << ": " << e.message() << "\n";
    return 2;
  } catch (const std::exception& e) {
    std::cerr << "render_record: " << e.what() << "\n";
    return 2;
  }
  return 0;
}
