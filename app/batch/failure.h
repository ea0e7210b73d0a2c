// How sharpey-batch reports a failure: every exception the libraries throw maps to one documented
// exit code (exit_codes.h) with the words printed on stderr. Library errors that carry no more
// specific type than sharpey::Error are given one by the stage they happen in (in_model_stage,
// in_output_stage), so no stage's failure is reported as another's.
#pragma once

#include <exception>
#include <string>
#include <typeinfo>
#include <utility>

#include "sharpey/error.h"
#include "sharpey/output/report_output.h"

namespace sharpey::batch {

struct Failure {
  int exit_code = 1;
  std::string kind;     // "bad input (key ...)", "mesher failure", ...
  std::string message;  // the exception's message
  std::string hint;     // a further "what to do" line, or empty
};

// The exit code and words for the exception `e` (from std::current_exception()).
Failure describe_failure(const std::exception_ptr& e);

// Runs `work`, which builds, solves or evaluates a model: a plain sharpey::Error it throws (the
// rigid-motion fit of the tooth, the PDL not covering the root surface: faults of the meshed
// model) becomes a MeshError. Typed errors pass unchanged.
template <class Work>
decltype(auto) in_model_stage(Work&& work) {
  try {
    return std::forward<Work>(work)();
  } catch (const Error& e) {
    if (typeid(e) != typeid(Error)) throw;
    throw MeshError(std::string("the meshed model is faulty: ") + e.what());
  }
}

// Runs `work`, which writes output files: a plain sharpey::Error it throws (the .vtu writer's
// I/O failures) becomes an analysis::OutputError.
template <class Work>
decltype(auto) in_output_stage(Work&& work) {
  try {
    return std::forward<Work>(work)();
  } catch (const Error& e) {
    if (typeid(e) != typeid(Error)) throw;
    throw analysis::OutputError(e.what());
  }
}

}  // namespace sharpey::batch
