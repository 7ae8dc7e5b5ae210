#include "json_text.h"

#include <tuple>
#include <utility>

namespace photolot::json_text {
namespace {

using Json = nlohmann::ordered_json;

std::pair<std::uint32_t, std::uint32_t> line_column(std::string_view text, std::size_t offset) {
  std::uint32_t line = 1, column = 1;
  for (std::size_t i = 0; i < offset && i < text.size(); ++i) {
    if (text[i] == '\n') {
      ++line;
      column = 1;
    } else if ((static_cast<unsigned char>(text[i]) & 0xC0) != 0x80) {
      ++column;  // a UTF-8 continuation byte does not start a character
    }
  }
  return {line, column};
}

}  // namespace

std::optional<SyntaxError> parse(std::string_view text, Json& out,
                                 const Json::parser_callback_t& callback) {
  try {
    out = Json::parse(text.begin(), text.end(), callback);
  } catch (const Json::parse_error& e) {
    // byte is the 1-based position of the character where parsing stopped.
    auto [line, column] = line_column(text, e.byte > 0 ? e.byte - 1 : 0);
    std::string message = e.what();
    // nlohmann's text starts "[json.exception.parse_error.101] parse error at line ..., column
    // ...: "; keep what follows, as the place is reported separately.
    if (auto pos = message.find(": "); pos != std::string::npos) message = message.substr(pos + 2);
    return SyntaxError{line, column, "not valid JSON: " + message};
  } catch (const Json::exception& e) {
    // A number beyond a double (1e400) is out_of_range: nlohmann names the token ("number
    // overflow parsing '1e400'") but not its place; its first occurrence is where it stands.
    std::string message = e.what();
    if (auto pos = message.find("] "); pos != std::string::npos) message = message.substr(pos + 2);
    std::uint32_t line = 0, column = 0;
    if (auto open = message.find('\''); open != std::string::npos) {
      const std::string token = message.substr(open + 1, message.rfind('\'') - open - 1);
      if (auto at = text.find(token); !token.empty() && at != std::string_view::npos)
        std::tie(line, column) = line_column(text, at);
    }
    return SyntaxError{line, column, "not valid JSON: " + message};
  }
  return std::nullopt;
}

}  // namespace photolot::json_text
