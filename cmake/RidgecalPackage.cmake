# Install rules and the package for find_package(ridgecal): the libraries
# ridgecal::fitter and ridgecal::firmware_export with their public headers, the
# executable ridgecal::ridgecal, the package config, its version file and
# RidgecalHeader.cmake. Included by the top-level CMakeLists.txt after every
# target is defined. Paths follow GNUInstallDirs. Internal headers
# (*/src/include) and the report and CLI libraries are not installed.
include_guard(GLOBAL)
include(GNUInstallDirs)
include(CMakePackageConfigHelpers)

set(RIDGECAL_CMAKE_INSTALL_DIR ${CMAKE_INSTALL_LIBDIR}/cmake/ridgecal)

set_target_properties(ridgecal_fitter PROPERTIES EXPORT_NAME fitter)
set_target_properties(ridgecal_firmware_export PROPERTIES EXPORT_NAME firmware_export)
install(TARGETS ridgecal_fitter ridgecal_firmware_export ridgecal
  EXPORT ridgecalTargets
  RUNTIME DESTINATION ${CMAKE_INSTALL_BINDIR}
  LIBRARY DESTINATION ${CMAKE_INSTALL_LIBDIR}
  ARCHIVE DESTINATION ${CMAKE_INSTALL_LIBDIR}
  INCLUDES DESTINATION ${CMAKE_INSTALL_INCLUDEDIR})
install(DIRECTORY ${PROJECT_SOURCE_DIR}/fitter/include/ ${PROJECT_SOURCE_DIR}/firmware-export/include/
  DESTINATION ${CMAKE_INSTALL_INCLUDEDIR}
  FILES_MATCHING PATTERN "*.hpp")
install(EXPORT ridgecalTargets
  NAMESPACE ridgecal::
  FILE ridgecalTargets.cmake
  DESTINATION ${RIDGECAL_CMAKE_INSTALL_DIR})

# A static fitter carries its private OpenSSL dependency into its consumers' link.
get_target_property(_ridgecal_fitter_type ridgecal_fitter TYPE)
if(_ridgecal_fitter_type STREQUAL "STATIC_LIBRARY")
  set(RIDGECAL_FIND_OPENSSL ON)
else()
  set(RIDGECAL_FIND_OPENSSL OFF)
endif()

configure_package_config_file(
  ${PROJECT_SOURCE_DIR}/cmake/ridgecalConfig.cmake.in
  ${PROJECT_BINARY_DIR}/cmake/ridgecalConfig.cmake
  INSTALL_DESTINATION ${RIDGECAL_CMAKE_INSTALL_DIR})
write_basic_package_version_file(
  ${PROJECT_BINARY_DIR}/cmake/ridgecalConfigVersion.cmake
  VERSION ${PROJECT_VERSION} COMPATIBILITY SameMajorVersion)
install(FILES
  ${PROJECT_BINARY_DIR}/cmake/ridgecalConfig.cmake
  ${PROJECT_BINARY_DIR}/cmake/ridgecalConfigVersion.cmake
  ${PROJECT_SOURCE_DIR}/cmake/RidgecalHeader.cmake
  DESTINATION ${RIDGECAL_CMAKE_INSTALL_DIR})
