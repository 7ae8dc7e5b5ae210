// libFuzzer's entry for one fuzz program; PHOTOLOT_FUZZ_TARGET names which entry point of
// fuzz_entry.h it drives ("import", "spec", "results", "workspace"). See scripts/fuzz.sh.
#include "fuzz_entry.h"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  static const photolot::fuzz::EntryPoint entry = photolot::fuzz::entry_point(PHOTOLOT_FUZZ_TARGET);
  entry(data, size);
  return 0;
}
