// Test helper: checks record files the way every consumer does
// (load_record_checked). For each file prints "FILE ok SHA256-OF-INPUT" or
// "FILE BAD message"; exits 0 only if every file is an intact record.
// usage: record_check RECORD.json...
#include <iostream>

#include "ridgecal/errors.hpp"
#include "ridgecal/record_guard.hpp"

int main(int argc, char** argv) {
  int bad = 0;
  for (int i = 1; i < argc; ++i) {
    try {
      const ridgecal::GuardedRecord r =
          ridgecal::load_record_checked(argv[i], /*allow_modified=*/false);
      std::cout << argv[i] << " ok " << r.record.input.sha256 << "\n";
    } catch (const ridgecal::InputError& e) {
      std::cout << argv[i] << " BAD " << e.what() << "\n";
      ++bad;
    }
  }
  return (argc > 1 && bad == 0) ? 0 : 1;
}
