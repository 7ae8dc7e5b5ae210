// Input-file fingerprints for the results document: size and 64-bit FNV-1a.
// FNV-1a: hash = offset basis; for each byte: hash ^= byte; hash *= prime (mod 2^64), with
// offset basis 14695981039346656037 and prime 1099511628211 (Fowler, Noll and Vo, as in the
// IETF draft "The FNV Non-Cryptographic Hash Algorithm"). A fingerprint, not a security hash.
#include <fmt/format.h>

#include "photolot/results.h"

namespace photolot::results {

std::uint64_t fnv1a64(std::string_view bytes) {
  std::uint64_t hash = 14695981039346656037ULL;
  for (unsigned char c : bytes) {
    hash ^= c;
    hash *= 1099511628211ULL;
  }
  return hash;
}

std::string fnv1a64_hex(std::string_view bytes) { return fmt::format("{:016x}", fnv1a64(bytes)); }

InputFile describe_content(const std::string& path, std::string_view content) {
  return InputFile{path, content.size(), fnv1a64_hex(content)};
}

}  // namespace photolot::results
