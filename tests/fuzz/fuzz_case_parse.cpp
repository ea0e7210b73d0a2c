// libFuzzer target for the case-file reader and validator (scripts/fuzz.sh builds it with clang-14
// and runs it on tests/fuzz/corpus for a fixed time). Any text must end in a CaseSpec or an
// InputError: another exception, a crash, a hang, a leak or undefined behaviour is a bug. A case
// that is accepted must also survive writing it back (case_to_json) and reading it again, as
// case_spec.h promises.
#include <cstddef>
#include <cstdint>
#include <string>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/error.h"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  using namespace sharpey;
  const std::string text(reinterpret_cast<const char*>(data), size);
  analysis::CaseSpec spec;
  try {
    spec = analysis::parse_case(text, "fuzz.json");
  } catch (const InputError&) {
    return 0;  // refused with a message naming the key: the expected outcome for most inputs
  }
  // Accepted: the written form reads back to the same case (an exception here ends the run).
  if (analysis::parse_case(analysis::case_to_json(spec), "round trip") != spec) __builtin_trap();
  return 0;
}
