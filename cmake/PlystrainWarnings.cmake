# Project code is compiled with strict warnings; third-party headers are
# included as SYSTEM so their warnings do not count against us.
add_library(plystrain_warnings INTERFACE)
target_compile_options(plystrain_warnings INTERFACE -Wall -Wextra -Wpedantic -Wshadow)
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
