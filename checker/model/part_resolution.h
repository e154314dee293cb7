/// \file
/// Maps netlist elements to parts (spec 4.3): the XML `part` attribute wins, then the project's
/// `assign` globs, then the library's `match` rules. X instances modelled by a part become black
/// boxes: everything flattened out of them is marked hidden.
#pragma once

#include "checker/core/diagnostics.h"
#include "checker/model/circuit.h"
#include "checker/model/parts.h"

#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace gateloop {

/// Case-insensitive glob with `*` and `?`.
bool globMatch(std::string_view pattern, std::string_view text);

/// Sets Component::part for every element that maps to a part, and Component::hidden for the
/// contents of part-modelled subcircuit instances. An `assign` or XML part id that names no part
/// is an error at \p assignWhere / the element.
void resolveParts(Circuit &circuit, const PartLibrary &lib,
                  const std::vector<std::pair<std::string, std::string>> &assign,
                  SourceLocation assignWhere, const std::string &assignFieldPath,
                  InputDiagnostics &diags);

} // namespace gateloop
