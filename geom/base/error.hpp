// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// The one error hierarchy of trimwright. Expected outcomes (a correction out of range, a failed
/// check) are values; conditions that stop a command throw one of these. `cli/main.cpp` is the
/// only catch site and maps each class to its exit code (design.md §7).

#include <stdexcept>
#include <string>

namespace trimwright {

/// Process exit codes (design.md §7).
enum class ExitCode : int {
  kDone = 0,        ///< finished
  kCannotMeet = 1,  ///< the job cannot be met or fails a safety check
  kBadInput = 2,    ///< bad command line or bad job file
  kFileError = 3,   ///< a file could not be read or written
};

/// Base of every error that stops a command. The message is one line, complete by itself.
class Error : public std::runtime_error {
 public:
  Error(ExitCode code, const std::string& message) : std::runtime_error(message), code_(code) {}
  /// The exit code this error maps to.
  ExitCode code() const { return code_; }

 private:
  ExitCode code_;
};

/// Bad command line or job file (exit 2). Messages name file:line, key, value and what was expected.
class InputError : public Error {
 public:
  explicit InputError(const std::string& message) : Error(ExitCode::kBadInput, message) {}
};

/// The job is valid but cannot be met, or a safety check failed and was not accepted (exit 1).
class CannotMeetError : public Error {
 public:
  explicit CannotMeetError(const std::string& message) : Error(ExitCode::kCannotMeet, message) {}
};

/// A file could not be read or written (exit 3).
class FileError : public Error {
 public:
  explicit FileError(const std::string& message) : Error(ExitCode::kFileError, message) {}
};

/// A broken internal invariant: a bug in trimwright, never the user's input (exit 1 from main with
/// a request to report it). Use sparingly, for conditions that tests should make impossible.
class InternalError : public Error {
 public:
  explicit InternalError(const std::string& message)
      : Error(ExitCode::kCannotMeet, "internal error: " + message) {}
};

}  // namespace trimwright
