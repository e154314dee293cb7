/// \file
/// Reader for the neutral XML netlist (spec 4.2), with pugixml.
#pragma once

#include "checker/core/diagnostics.h"
#include "checker/model/circuit.h"

#include <string>
#include <string_view>

namespace gateloop {

/// Reads the flat XML netlist at \p path into \p out. Errors carry the XML line and column of the
/// offending element. Returns false when an error was reported.
bool readXmlNetlist(const std::string &path, FileTable &files, Circuit &out, InputDiagnostics &diags);
bool readXmlNetlistText(std::string_view text, const std::string &displayName, FileTable &files,
                        Circuit &out, InputDiagnostics &diags);

} // namespace gateloop
