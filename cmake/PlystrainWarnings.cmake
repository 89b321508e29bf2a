# Project code is compiled with strict warnings; third-party headers are
# included as SYSTEM so their warnings do not count against us.
add_library(plystrain_warnings INTERFACE)
target_compile_options(plystrain_warnings INTERFACE -Wall -Wextra -Wpedantic -Wshadow)
# GCC 12 reports a false -Wrestrict inside std::string concatenation at -O2
# and above (GCC bug 105329); it says nothing about our code.
if(CMAKE_CXX_COMPILER_ID STREQUAL "GNU" AND CMAKE_CXX_COMPILER_VERSION VERSION_LESS 13)
  target_compile_options(plystrain_warnings INTERFACE -Wno-restrict)
endif()
# With the sanitizers' instrumentation GCC's flow analysis reports
# -Wmaybe-uninitialized inside the standard library (<regex>, <functional>);
# the GCC manual warns that sanitizers make this warning unreliable. It stays
# an error in the release build.
if(PLYSTRAIN_SANITIZE AND CMAKE_CXX_COMPILER_ID STREQUAL "GNU")
  target_compile_options(plystrain_warnings INTERFACE -Wno-maybe-uninitialized)
endif()
if(PLYSTRAIN_WERROR)
  target_compile_options(plystrain_warnings INTERFACE -Werror)
endif()

add_library(plystrain_sanitizers INTERFACE)
if(PLYSTRAIN_SANITIZE)
  target_compile_options(plystrain_sanitizers INTERFACE
    -fsanitize=address,undefined -fno-omit-frame-pointer -fno-sanitize-recover=undefined)
  target_link_options(plystrain_sanitizers INTERFACE -fsanitize=address,undefined)
endif()

# Every project target links this one helper.
function(plystrain_project_target target)
  target_link_libraries(${target} PRIVATE plystrain_warnings plystrain_sanitizers)
endfunction()
