// ridgecal (internal): the batch's output directory (batch_output_dir.cpp).
#pragma once

#include <string>
#include <vector>

#include "ridgecal/batch_run.hpp"

namespace ridgecal {

/// The directory of the per-unit records: <out_dir>/records.
std::string batch_records_dir(const BatchOptions& o);

/// Throws InputError when an input is one of the batch's outputs (a summary,
/// the lock file) or lies in a directory the batch writes a file per unit into.
void refuse_inputs_as_outputs(const std::vector<std::string>& inputs, const BatchOptions& options);

}  // namespace ridgecal
