# photolot_warnings: an interface target every photolot target links to, so warnings and
# sanitizers are set in one place.
add_library(photolot_warnings INTERFACE)
target_compile_options(photolot_warnings INTERFACE
  $<$<CXX_COMPILER_ID:GNU,Clang>:-Wall -Wextra -Wpedantic -Wshadow=local -Wno-unused-parameter>
  # GCC 12 reports -Wrestrict inside libstdc++'s own string code for ordinary concatenations
  # (GCC bug 105329, a false positive); it would bury real warnings, so it is off for GCC.
  $<$<CXX_COMPILER_ID:GNU>:-Wno-restrict>
  $<$<BOOL:${PHOTOLOT_WERROR}>:-Werror>)
if(PHOTOLOT_SANITIZE)
  target_compile_options(photolot_warnings INTERFACE
    -fsanitize=address,undefined -fno-omit-frame-pointer -fno-sanitize-recover=undefined)
  target_link_options(photolot_warnings INTERFACE -fsanitize=address,undefined)
endif()
