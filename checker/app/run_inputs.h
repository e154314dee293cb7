/// \file
/// Reading every input of a run: the project file (or one design given on the command line),
/// its netlists, parts libraries and layout sidecars. All problems are collected before the run
/// decides to stop, so the user sees every bad field at once.
#pragma once

#include "checker/core/diagnostics.h"
#include "checker/model/circuit.h"
#include "checker/model/layout.h"
#include "checker/model/parts.h"
#include "checker/model/project.h"

#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace gateloop {

/// What the user pointed the tool at.
struct InputSelection {
  std::string projectPath;               ///< explicit project file; empty = search or --netlist
  std::string netlistPath;               ///< --netlist
  std::string layoutPath;                ///< --layout
  std::vector<std::string> partsPaths;   ///< --parts
  std::string operatingPath;             ///< --operating
  bool allowOutsideRoot = false;
  std::size_t maxElements = 5'000'000;
};

/// One design with everything read for it.
struct LoadedDesign {
  DesignSpec spec;
  Circuit circuit;
  PartLibrary parts;
  std::optional<Layout> layout;
  FileId netlistFile = 0;
};

struct RunInputs {
  FileTable files;
  Project project;
  std::vector<std::unique_ptr<LoadedDesign>> designs;
  InputDiagnostics diags;
  std::string projectDisplayPath;        ///< empty when the design came from --netlist
};

/// Reads one netlist into \p circuit: the XML reader for `.xml` files, the SPICE reader for
/// everything else, with includes kept below \p projectRoot unless \p sel allows otherwise.
/// Returns the file id of the netlist (0 when it could not be registered).
FileId readNetlist(const std::string &path, const std::string &projectRoot, const InputSelection &sel,
                   FileTable &files, Circuit &circuit, InputDiagnostics &diags);

/// The folder of \p file as an absolute, normalised path.
std::string absoluteFolderOf(const std::string &file);

/// Reads everything \p sel names into \p run. Returns false when any input error was found
/// (the diagnostics say which); notes and warnings do not fail.
bool loadRunInputs(const InputSelection &sel, RunInputs &run);

/// Reads one design of a project (netlist, parts, layout; resolves parts).
void loadDesign(const DesignSpec &spec, const Project &project, const InputSelection &sel, RunInputs &run);

} // namespace gateloop
