# All third-party libraries are found here, once, and exposed as imported
# targets. Debian 12 ships CMake configs for Eigen, CLI11, toml++, Catch2 and
# VTK; SuiteSparse and Gmsh need find_path/find_library.

find_package(Eigen3 3.4 REQUIRED NO_MODULE)
find_package(OpenMP REQUIRED COMPONENTS CXX)
find_package(CLI11 REQUIRED)
find_package(tomlplusplus REQUIRED)
# JSON output (results.json) and reading it back in tests.
find_package(nlohmann_json 3.10 REQUIRED)
find_package(VTK 9.1 REQUIRED COMPONENTS CommonCore CommonDataModel IOXML IOLegacy)

find_path(CHOLMOD_INCLUDE_DIR cholmod.h PATH_SUFFIXES suitesparse REQUIRED)
find_library(CHOLMOD_LIBRARY cholmod REQUIRED)
find_library(UMFPACK_LIBRARY umfpack REQUIRED)
find_library(AMD_LIBRARY amd REQUIRED)
find_library(COLAMD_LIBRARY colamd REQUIRED)
find_library(SUITESPARSECONFIG_LIBRARY suitesparseconfig REQUIRED)
find_package(BLAS REQUIRED)
find_package(LAPACK REQUIRED)
add_library(plystrain::suitesparse INTERFACE IMPORTED)
target_include_directories(plystrain::suitesparse SYSTEM INTERFACE ${CHOLMOD_INCLUDE_DIR})
target_link_libraries(plystrain::suitesparse INTERFACE
  ${UMFPACK_LIBRARY} ${CHOLMOD_LIBRARY} ${AMD_LIBRARY} ${COLAMD_LIBRARY}
  ${SUITESPARSECONFIG_LIBRARY} ${LAPACK_LIBRARIES} ${BLAS_LIBRARIES})

find_path(GMSH_INCLUDE_DIR gmsh.h REQUIRED)
find_library(GMSH_LIBRARY gmsh REQUIRED)
add_library(plystrain::gmsh INTERFACE IMPORTED)
target_include_directories(plystrain::gmsh SYSTEM INTERFACE ${GMSH_INCLUDE_DIR})
target_link_libraries(plystrain::gmsh INTERFACE ${GMSH_LIBRARY})

if(PLYSTRAIN_BUILD_TESTS)
  find_package(Catch2 REQUIRED)
  include(Catch)
endif()
