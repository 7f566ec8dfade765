// ridgecal: the public C++ API of the C header generator (target
// ridgecal::firmware_export), in one include: generate_header() for every
// model, through the firmware_model() adapter. Headers under
// firmware-export/src/include/ are internal and are not installed.
#pragma once

#include "ridgecal/firmware/export.hpp"
#include "ridgecal/firmware/firmware_model.hpp"
#include "ridgecal/firmware/fixed_point.hpp"
#include "ridgecal/firmware/float_emulation.hpp"
#include "ridgecal/firmware/numeric_mode.hpp"
