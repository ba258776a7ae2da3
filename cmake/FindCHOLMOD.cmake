# FindCHOLMOD: locate SuiteSparse's CHOLMOD (Debian's libsuitesparse-dev ships no CMake
# config and no pkg-config file for it). Defines the imported target CHOLMOD::CHOLMOD.
#
# With GRADELINE_STATIC_CHOLMOD (the default where the static archives are installed, as
# libsuitesparse-dev does), CHOLMOD and its orderings are linked from their archives and the
# BLAS, LAPACK and METIS routines it calls are looked up on first use
# (src/solver/blas_loader.cc, in the target gradeline_blas_loader, which the including
# project defines): a run that never factorises supernodally never loads them. CHOLMOD_STATIC
# tells which way was taken.
option(GRADELINE_STATIC_CHOLMOD "Link CHOLMOD statically; load the BLAS on first use" ON)
find_path(CHOLMOD_INCLUDE_DIR cholmod.h PATH_SUFFIXES suitesparse)
find_library(CHOLMOD_LIBRARY cholmod)
find_library(SUITESPARSECONFIG_LIBRARY suitesparseconfig)
find_library(AMD_LIBRARY amd)  # called directly for the fill-reducing renumbering
include(FindPackageHandleStandardArgs)
find_package_handle_standard_args(CHOLMOD
  REQUIRED_VARS CHOLMOD_LIBRARY SUITESPARSECONFIG_LIBRARY AMD_LIBRARY CHOLMOD_INCLUDE_DIR)

set(CHOLMOD_STATIC FALSE)
# CHOLMOD's archive calls the OpenMP runtime (libgomp's entry points, which LLVM's libomp
# provides too); without an OpenMP the compiler can link, the shared library is used.
find_package(OpenMP QUIET)
if(CHOLMOD_FOUND AND GRADELINE_STATIC_CHOLMOD AND OpenMP_CXX_FOUND)
  # In link order: CHOLMOD before the orderings it calls, the common configuration last.
  set(_gradeline_archives cholmod ccolamd camd colamd amd suitesparseconfig)
  set(CHOLMOD_ARCHIVES "")
  set(CHOLMOD_STATIC TRUE)
  foreach(_name IN LISTS _gradeline_archives)
    find_library(CHOLMOD_ARCHIVE_${_name} NAMES lib${_name}.a)
    mark_as_advanced(CHOLMOD_ARCHIVE_${_name})
    if(NOT CHOLMOD_ARCHIVE_${_name})
      set(CHOLMOD_STATIC FALSE)
    endif()
    list(APPEND CHOLMOD_ARCHIVES "${CHOLMOD_ARCHIVE_${_name}}")
  endforeach()
endif()

if(CHOLMOD_FOUND AND NOT TARGET CHOLMOD::CHOLMOD)
  if(CHOLMOD_STATIC)
    add_library(CHOLMOD::CHOLMOD INTERFACE IMPORTED)
    set_target_properties(CHOLMOD::CHOLMOD PROPERTIES
      INTERFACE_INCLUDE_DIRECTORIES "${CHOLMOD_INCLUDE_DIR}"
      INTERFACE_LINK_LIBRARIES
        "${CHOLMOD_ARCHIVES};gradeline_blas_loader;OpenMP::OpenMP_CXX;${CMAKE_DL_LIBS};m")
  else()
    add_library(CHOLMOD::CHOLMOD UNKNOWN IMPORTED)
    set_target_properties(CHOLMOD::CHOLMOD PROPERTIES
      IMPORTED_LOCATION "${CHOLMOD_LIBRARY}"
      INTERFACE_INCLUDE_DIRECTORIES "${CHOLMOD_INCLUDE_DIR}"
      INTERFACE_LINK_LIBRARIES "${AMD_LIBRARY};${SUITESPARSECONFIG_LIBRARY}")
  endif()
endif()
mark_as_advanced(CHOLMOD_INCLUDE_DIR CHOLMOD_LIBRARY SUITESPARSECONFIG_LIBRARY AMD_LIBRARY)
