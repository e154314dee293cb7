/// \file
/// Writing a report without ever leaving a half-written file: the text goes to a temporary file
/// beside the target, which replaces the target only once it is complete.
#pragma once

#include <string>

namespace gateloop {

/// Writes \p content to \p path atomically, or to stdout when \p path is empty or "-".
/// Returns an error message, empty on success.
std::string writeOutputAtomically(const std::string &path, const std::string &content);

} // namespace gateloop
