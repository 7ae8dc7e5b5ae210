// Parsing JSON text with the place of a syntax error (internal to core): the results document
// and the workspace document report a broken file the same way, "line:column: not valid JSON:
// <what nlohmann says>", lines and columns 1-based, columns counted in characters.
#pragma once

#include <cstdint>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <string_view>

namespace photolot::json_text {

struct SyntaxError {
  std::uint32_t line = 0;  // 0 when the place is not known
  std::uint32_t column = 0;
  std::string message;  // "not valid JSON: ..."
};

// Parses `text` into `out`; `callback` as nlohmann's parser takes it (may be empty).
std::optional<SyntaxError> parse(
    std::string_view text, nlohmann::ordered_json& out,
    const nlohmann::ordered_json::parser_callback_t& callback = nullptr);

}  // namespace photolot::json_text
