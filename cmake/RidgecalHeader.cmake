# RidgecalHeader.cmake -- regenerate a firmware calibration header from a
# ridgecal calibration record at build time.
#
#   ridgecal_generate_header(
#     TARGET  <target>          # target that includes the header (required)
#     RECORD  <record.json>     # calibration record from `ridgecal fit` (required)
#     PREFIX  <name>            # C symbol prefix (required)
#     OUTPUT  <path/name.h>     # header to generate (required; relative = in the binary dir)
#     [NUMERIC float|double|fixed]          # default float
#     [MAX_DEVIATION_FRACTION <f>] [TOLERANCE <abs>]
#     [RAW_MIN <n>] [RAW_MAX <n>] [INPUT_SCALE <s>] [OUTPUT_SCALE <s>]   # fixed mode
#     [AUX_SCALE <s>] [AUX_RAW_MIN <n>] [AUX_RAW_MAX <n>]    # fixed mode, records with an aux input
#     [NO_FP_CONTRACT_FLAG]     # do not add -ffp-contract=off to TARGET
#     [ALLOW_UNPASSED])         # also for a record whose verdict is not PASS
#                               # (PREFIX_VERDICT then says FAIL or NOT_JUDGED)
#
# The header is rebuilt whenever the record (or the ridgecal executable)
# changes. The export refuses (and the build fails, leaving any previous
# header untouched) when the header's arithmetic deviates from the model by
# more than the allowed fraction of the tolerance, and when the record's
# verdict is not PASS unless ALLOW_UNPASSED is given. The directory of OUTPUT is
# added to TARGET's include path, and for GCC/Clang C and C++ sources
# -ffp-contract=off is added to TARGET (the header's bit-exactness needs it).
#
# The ridgecal executable: the cache variable RIDGECAL_EXECUTABLE if set, else
# the imported target ridgecal::ridgecal (defined by find_package(ridgecal)),
# else a target named ridgecal in the same build.
include_guard(GLOBAL)

set(RIDGECAL_EXECUTABLE "" CACHE FILEPATH "ridgecal executable used by ridgecal_generate_header")

function(ridgecal_generate_header)
  set(options NO_FP_CONTRACT_FLAG ALLOW_UNPASSED)
  set(one TARGET RECORD PREFIX OUTPUT NUMERIC MAX_DEVIATION_FRACTION TOLERANCE RAW_MIN RAW_MAX
          INPUT_SCALE OUTPUT_SCALE AUX_SCALE AUX_RAW_MIN AUX_RAW_MAX)
  cmake_parse_arguments(PARSE_ARGV 0 RG "${options}" "${one}" "")
  foreach(req TARGET RECORD PREFIX OUTPUT)
    if(NOT RG_${req})
      message(FATAL_ERROR "ridgecal_generate_header: ${req} is required")
    endif()
  endforeach()
  if(RG_UNPARSED_ARGUMENTS)
    message(FATAL_ERROR "ridgecal_generate_header: unknown arguments: ${RG_UNPARSED_ARGUMENTS}")
  endif()
  if(NOT TARGET ${RG_TARGET})
    message(FATAL_ERROR "ridgecal_generate_header: '${RG_TARGET}' is not a target")
  endif()
  if(NOT RG_NUMERIC)
    set(RG_NUMERIC float)
  endif()
  if(NOT RG_NUMERIC MATCHES "^(float|double|fixed)$")
    message(FATAL_ERROR "ridgecal_generate_header: NUMERIC '${RG_NUMERIC}' must be float, double or fixed")
  endif()

  if(RIDGECAL_EXECUTABLE)
    set(exe "${RIDGECAL_EXECUTABLE}")
    set(exe_dep "${RIDGECAL_EXECUTABLE}")
  elseif(TARGET ridgecal::ridgecal)
    set(exe "$<TARGET_FILE:ridgecal::ridgecal>")
    set(exe_dep ridgecal::ridgecal)
  elseif(TARGET ridgecal)
    set(exe "$<TARGET_FILE:ridgecal>")
    set(exe_dep ridgecal)
  else()
    message(FATAL_ERROR "ridgecal_generate_header: no ridgecal executable; use find_package(ridgecal) "
                        "or set RIDGECAL_EXECUTABLE")
  endif()

  get_filename_component(record "${RG_RECORD}" ABSOLUTE BASE_DIR "${CMAKE_CURRENT_SOURCE_DIR}")
  get_filename_component(output "${RG_OUTPUT}" ABSOLUTE BASE_DIR "${CMAKE_CURRENT_BINARY_DIR}")
  get_filename_component(outdir "${output}" DIRECTORY)

  set(args export "${record}" --prefix "${RG_PREFIX}" --numeric "${RG_NUMERIC}" -o "${output}")
  foreach(pair MAX_DEVIATION_FRACTION:--max-deviation-fraction TOLERANCE:--tolerance RAW_MIN:--raw-min
               RAW_MAX:--raw-max INPUT_SCALE:--input-scale OUTPUT_SCALE:--output-scale
               AUX_SCALE:--aux-scale AUX_RAW_MIN:--aux-raw-min AUX_RAW_MAX:--aux-raw-max)
    string(REPLACE ":" ";" kv "${pair}")
    list(GET kv 0 key)
    list(GET kv 1 flag)
    if(DEFINED RG_${key} AND NOT "${RG_${key}}" STREQUAL "")
      list(APPEND args ${flag} "${RG_${key}}")
    endif()
  endforeach()

  if(RG_ALLOW_UNPASSED)
    list(APPEND args --allow-unpassed)
  endif()

  add_custom_command(
    OUTPUT "${output}"
    COMMAND "${CMAKE_COMMAND}" -E make_directory "${outdir}"
    COMMAND ${exe} ${args}
    DEPENDS "${record}" ${exe_dep}
    COMMENT "ridgecal: generating ${RG_NUMERIC} calibration header ${output}"
    VERBATIM)
  target_sources(${RG_TARGET} PRIVATE "${output}")
  target_include_directories(${RG_TARGET} PRIVATE "${outdir}")
  if(NOT RG_NO_FP_CONTRACT_FLAG)
    target_compile_options(${RG_TARGET} PRIVATE
      "$<$<COMPILE_LANG_AND_ID:C,GNU,Clang,AppleClang>:-ffp-contract=off>"
      "$<$<COMPILE_LANG_AND_ID:CXX,GNU,Clang,AppleClang>:-ffp-contract=off>")
  endif()
endfunction()
