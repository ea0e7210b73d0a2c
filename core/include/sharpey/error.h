// Typed exceptions shared by all Sharpey libraries.
//
// Libraries never print and never abort on bad data; they throw one of these. The message says
// what failed, the offending value, the likely cause and what to do next. Programmer errors use
// assertions instead.
#pragma once

#include <stdexcept>
#include <string>
#include <utility>

namespace sharpey {

// Base of every data error Sharpey reports to a user.
class Error : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

// A parameter or case-file value is malformed or out of range. `key` names the offending
// parameter (a case-file path such as "scenarios[2].bone_loss_mm" or a struct field name).
class InputError : public Error {
 public:
  InputError(std::string key, const std::string& message) : Error(message), key_(std::move(key)) {}
  const std::string& key() const { return key_; }

 private:
  std::string key_;
};

// Geometry could not be built or TetGen failed; the message names the stage and parameters.
class MeshError : public Error {
 public:
  using Error::Error;
};

// The linear system could not be factorised or solved (singular, unconstrained, not positive
// definite, residual too large).
class SolverError : public Error {
 public:
  using Error::Error;
};

// A report file could not be written (disk full, no permission, missing folder).
class OutputError : public Error {
 public:
  using Error::Error;
};

// The user cancelled a long-running operation through a cancel flag.
class Cancelled : public Error {
 public:
  Cancelled() : Error("cancelled by the user") {}
};

}  // namespace sharpey
