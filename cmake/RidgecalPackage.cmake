# Install rules for find_package(ridgecal): the package config, its version
# file and RidgecalHeader.cmake. The ridgecal executable itself is installed
# by cli/CMakeLists.txt into ${CMAKE_INSTALL_BINDIR}.
include_guard(GLOBAL)
include(GNUInstallDirs)
include(CMakePackageConfigHelpers)

set(RIDGECAL_CMAKE_INSTALL_DIR ${CMAKE_INSTALL_LIBDIR}/cmake/ridgecal)
configure_package_config_file(
  ${PROJECT_SOURCE_DIR}/cmake/ridgecalConfig.cmake.in
  ${PROJECT_BINARY_DIR}/cmake/ridgecalConfig.cmake
  INSTALL_DESTINATION ${RIDGECAL_CMAKE_INSTALL_DIR}
  PATH_VARS CMAKE_INSTALL_BINDIR)
write_basic_package_version_file(
  ${PROJECT_BINARY_DIR}/cmake/ridgecalConfigVersion.cmake
  VERSION ${PROJECT_VERSION} COMPATIBILITY SameMajorVersion)
install(FILES
  ${PROJECT_BINARY_DIR}/cmake/ridgecalConfig.cmake
  ${PROJECT_BINARY_DIR}/cmake/ridgecalConfigVersion.cmake
  ${PROJECT_SOURCE_DIR}/cmake/RidgecalHeader.cmake
  DESTINATION ${RIDGECAL_CMAKE_INSTALL_DIR})
