/// \file
/// Readers for the JSON inputs: parts library (4.3), layout sidecar (4.4), project file (4.5).
/// A wrong or missing field is an input error naming the file and the field path
/// (`parts.json: parts.Q-SW1.c_ies: error: expected a capacitance, got "4.7 nH"`); a JSON syntax
/// error carries line and column. All problems in a file are reported, not only the first.
#pragma once

#include "checker/core/diagnostics.h"
#include "checker/model/layout.h"
#include "checker/model/parts.h"
#include "checker/model/project.h"

#include <optional>
#include <string>

namespace gateloop {

/// Appends the parts of the library at \p path to \p lib. A part id defined twice is an error.
bool readPartsLibrary(const std::string &path, FileTable &files, PartLibrary &lib,
                      InputDiagnostics &diags);

bool readLayout(const std::string &path, FileTable &files, Layout &out, InputDiagnostics &diags);

/// Reads a project file; paths inside it are made relative to the current directory (joined with
/// the project file's folder), and rootDir is set to that folder.
bool readProject(const std::string &path, FileTable &files, Project &out, InputDiagnostics &diags);

/// Reads a stand-alone operating-point file (`--operating F`): a JSON object with the keys of a
/// design's `operating` object, optionally with `"schema": "gateloop-operating/1"`. The file's
/// values are laid over those already in \p out; fields it leaves out keep their values.
bool readOperatingPoint(const std::string &path, FileTable &files, OperatingPoint &out,
                        InputDiagnostics &diags);

/// Walks up from \p startDir looking for gateloop.json; nullopt when none.
std::optional<std::string> findProjectFile(const std::string &startDir);

} // namespace gateloop
