// A helper for nothing_lost_test: writes SIZE_MB megabytes of the byte FILL to TARGET through
// photolot's atomic writer, as photolot-cli writes its results. Exit 0 when written.
#include <cstdio>
#include <cstdlib>
#include <string>

#include "photolot/atomic_file.h"

int main(int argc, char** argv) {
  if (argc != 4) {
    std::fprintf(stderr, "usage: atomic_writer TARGET SIZE_MB FILL\n");
    return 2;
  }
  const std::string content(std::strtoul(argv[2], nullptr, 10) << 20, argv[3][0]);
  if (auto error = photolot::write_file_atomically(argv[1], content)) {
    std::fprintf(stderr, "%s: %s\n", error->path.c_str(), error->message.c_str());
    return 1;
  }
  return 0;
}
