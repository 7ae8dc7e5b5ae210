// Shared by the bad-input catalogue's tests (docs/bad-input.md): each test is named after its
// row's ID (L.., S.., R.., C..) and feeds the row's input to the real entry point.
#pragma once

#include <gtest/gtest.h>

#include <filesystem>
#include <string>
#include <vector>

#include "photolot/import.h"

namespace photolot::test {

// A good log of two units at four levels, to sit beside a bad file: what must be kept.
inline const char* kGoodLog =
    "unit,lux,ohm\n"
    "G1,1,100000\nG1,10,20000\nG1,100,4000\nG1,1000,800\n"
    "G2,1,110000\nG2,10,21000\nG2,100,4100\nG2,1000,810\n";

// Imports `bad` (written as a file named `name`) beside the good log, through import_files.
ImportResult import_beside_good(const std::string& name, const std::string& bad);

// The first file error or diagnostic whose message contains `text`, as "line:column: message";
// "" when there is none.
std::string find_message(const ImportResult& r, const std::string& text);

// The readings of unit `id` (0 when it is absent).
std::size_t readings_of(const ImportResult& r, const std::string& id);

// Lists the IDs of docs/bad-input.md's rows, in order.
std::vector<std::string> catalogue_ids();

}  // namespace photolot::test
