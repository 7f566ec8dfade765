#include "ridgecal/record_guard.hpp"

#include <fmt/format.h>

#include "ridgecal/errors.hpp"

namespace ridgecal {

namespace {
GuardedRecord check(const nlohmann::json& j, const std::string& file, bool allow_modified) {
  GuardedRecord out;
  out.seal = record_seal(j);
  out.modified = !out.seal.intact();
  if (out.modified && !allow_modified) {
    const bool has_digest = j.is_object() && j.contains("integrity");
    throw InputError(
        file, 0,
        has_digest ? "the record was modified after ridgecal wrote it (its integrity SHA-256 does "
                     "not match its content)"
                   : "the record has no integrity SHA-256, so it cannot be trusted",
        "re-create it with 'ridgecal fit' on the original data (the record's input member names "
        "the "
        "file and its SHA-256), or pass --allow-modified to use it anyway; the output will say so");
  }
  out.record = record_from_json(j, file);
  return out;
}
}  // namespace

GuardedRecord load_record_checked(const std::string& path, bool allow_modified) {
  return check(read_record_json(path), path, allow_modified);
}

GuardedRecord check_record_text(const std::string& text, const std::string& file,
                                bool allow_modified) {
  return check(parse_record_json(text, file), file, allow_modified);
}

std::string modified_record_note(const std::string& path) {
  return fmt::format(
      "NOTE: {} was modified after ridgecal wrote it (its integrity SHA-256 does not match); used "
      "because "
      "--allow-modified was given.",
      path);
}

const char* allow_modified_option_help() {
  return "use a record whose integrity SHA-256 does not match its content (edited by hand); the "
         "output notes it";
}

}  // namespace ridgecal
