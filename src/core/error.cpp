#include "coursewarden/error.hpp"

namespace coursewarden {

std::string error_text(const std::string& file, const std::string& where, const std::string& what) {
  std::string text;
  for (const std::string* part : {&file, &where, &what}) {
    if (part->empty()) continue;
    if (!text.empty()) text += ": ";
    text += *part;
  }
  return text;
}

void fail(const std::string& file, const std::string& where, const std::string& what) {
  throw Error(error_text(file, where, what));
}

}  // namespace coursewarden
