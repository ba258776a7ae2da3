# FindCHOLMOD: locate SuiteSparse's CHOLMOD (Debian's libsuitesparse-dev ships no CMake
# config and no pkg-config file for it). Defines the imported target CHOLMOD::CHOLMOD.
find_path(CHOLMOD_INCLUDE_DIR cholmod.h PATH_SUFFIXES suitesparse)
find_library(CHOLMOD_LIBRARY cholmod)
find_library(SUITESPARSECONFIG_LIBRARY suitesparseconfig)
find_library(AMD_LIBRARY amd)  # called directly for the fill-reducing renumbering
include(FindPackageHandleStandardArgs)
find_package_handle_standard_args(CHOLMOD
  REQUIRED_VARS CHOLMOD_LIBRARY SUITESPARSECONFIG_LIBRARY AMD_LIBRARY CHOLMOD_INCLUDE_DIR)
if(CHOLMOD_FOUND AND NOT TARGET CHOLMOD::CHOLMOD)
  add_library(CHOLMOD::CHOLMOD UNKNOWN IMPORTED)
  set_target_properties(CHOLMOD::CHOLMOD PROPERTIES
    IMPORTED_LOCATION "${CHOLMOD_LIBRARY}"
    INTERFACE_INCLUDE_DIRECTORIES "${CHOLMOD_INCLUDE_DIR}"
    INTERFACE_LINK_LIBRARIES "${AMD_LIBRARY};${SUITESPARSECONFIG_LIBRARY}")
endif()
mark_as_advanced(CHOLMOD_INCLUDE_DIR CHOLMOD_LIBRARY SUITESPARSECONFIG_LIBRARY AMD_LIBRARY)
