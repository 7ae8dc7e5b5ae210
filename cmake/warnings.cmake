# photolot_warnings: an interface target every photolot target links to, so warnings and
# sanitizers are set in one place.
add_library(photolot_warnings INTERFACE)
target_compile_options(photolot_warnings INTERFACE
  $<$<CXX_COMPILER_ID:GNU,Clang>:-Wall -Wextra -Wpedantic -Wno-unused-parameter>
  # Shadowing one local by another hides real bugs; GCC can warn on locals alone, while clang's
  # -Wshadow family would also flag every member-named constructor parameter, so GCC only.
  $<$<CXX_COMPILER_ID:GNU>:-Wshadow=local>
  # GCC 12 reports -Wrestrict inside libstdc++'s own string code for ordinary concatenations
  # (GCC bug 105329, a false positive); it would bury real warnings, so it is off for GCC.
  $<$<CXX_COMPILER_ID:GNU>:-Wno-restrict>
  $<$<BOOL:${PHOTOLOT_WERROR}>:-Werror>)
if(PHOTOLOT_SANITIZE)
  target_compile_options(photolot_warnings INTERFACE
    -fsanitize=address,undefined -fno-omit-frame-pointer -fno-sanitize-recover=undefined)
  target_link_options(photolot_warnings INTERFACE -fsanitize=address,undefined)
endif()
if(PHOTOLOT_FUZZ)
  if(NOT CMAKE_CXX_COMPILER_ID STREQUAL "Clang")
    message(FATAL_ERROR "PHOTOLOT_FUZZ needs clang (CC=clang-14 CXX=clang++-14)")
  endif()
  # Coverage for libFuzzer everywhere (the test programs of the same build carry it too, at a
  # small cost, so one sanitizer build serves both); the fuzz programs add -fsanitize=fuzzer.
  target_compile_options(photolot_warnings INTERFACE
    -fsanitize=fuzzer-no-link,address,undefined -fno-omit-frame-pointer
    -fno-sanitize-recover=undefined)
  target_link_options(photolot_warnings INTERFACE -fsanitize=address,undefined)
endif()
