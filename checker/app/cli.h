/// \file
/// The `gateloop` command line.
#pragma once

namespace gateloop {

/// Runs the command line; returns the process exit status (0 clean, 1 findings at or above the
/// fail level, 2 input or usage error).
int runCli(int argc, char **argv);

} // namespace gateloop
