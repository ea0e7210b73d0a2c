// The two kinds of failed check, kept apart as in the error guide (DEVELOPERS.md, Architecture):
//
// - SHARPEY_ASSERT(condition, message): a programmer error, a caller broke a documented
//   precondition (a vector of the wrong size, an index out of range). Always checked (keep the
//   condition cheap); throws sharpey::ProgrammingError, a std::logic_error that names the file,
//   line and condition. Programs report it as an internal error, never as bad input.
// - SHARPEY_CHECK(condition, error): a data error, something a user or a file can get wrong.
//   Throws `error`, one of the typed exceptions of sharpey/error.h, built only when the check
//   fails; its message says what failed, the value and the fix.
#pragma once

#include <stdexcept>
#include <string>

namespace sharpey {

// A precondition of a function was broken by its caller: a bug in the program, not in the data.
class ProgrammingError : public std::logic_error {
 public:
  using std::logic_error::logic_error;
};

namespace core::detail {
[[noreturn]] inline void assertion_failed(const char* file, int line, const char* condition,
                                          const std::string& message) {
  throw ProgrammingError(std::string(file) + ":" + std::to_string(line) + ": " + message +
                         " (failed: " + condition + ")");
}
}  // namespace core::detail

}  // namespace sharpey

#define SHARPEY_ASSERT(condition, message)                                                \
  do {                                                                                    \
    if (!(condition))                                                                     \
      ::sharpey::core::detail::assertion_failed(__FILE__, __LINE__, #condition, message); \
  } while (false)

#define SHARPEY_CHECK(condition, error) \
  do {                                  \
    if (!(condition)) throw error;      \
  } while (false)
