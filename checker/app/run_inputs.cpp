#include "checker/app/run_inputs.h"

#include "checker/model/part_resolution.h"
#include "netlist-io/json_inputs.h"
#include "netlist-io/spice_reader.h"
#include "netlist-io/xml_netlist_reader.h"

#include <filesystem>

namespace fs = std::filesystem;

namespace gateloop {

namespace {

bool looksLikeXml(const std::string &path) {
  std::string ext = fs::path(path).extension().string();
  for (char &c : ext) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return ext == ".xml";
}

} // namespace

std::string absoluteFolderOf(const std::string &file) {
  std::error_code ec;
  fs::path p = fs::absolute(fs::path(file), ec).parent_path();
  return fs::weakly_canonical(p, ec).string();
}

FileId readNetlist(const std::string &path, const std::string &projectRoot, const InputSelection &sel,
                   FileTable &files, Circuit &circuit, InputDiagnostics &diags) {
  std::size_t before = files.size();
  if (looksLikeXml(path)) {
    readXmlNetlist(path, files, circuit, diags);
  } else {
    SpiceReadOptions opts;
    opts.projectRoot = projectRoot;
    opts.allowOutsideRoot = sel.allowOutsideRoot;
    opts.maxElements = sel.maxElements;
    readSpiceDeck(path, opts, files, circuit, diags);
  }
  return files.size() > before ? static_cast<FileId>(before) : 0;
}

void loadDesign(const DesignSpec &spec, const Project &project, const InputSelection &sel, RunInputs &run) {
  auto design = std::make_unique<LoadedDesign>();
  design->spec = spec;

  design->netlistFile = readNetlist(spec.netlistPath, project.rootDir, sel, run.files, design->circuit, run.diags);

  std::vector<std::string> libs = project.partsPaths;
  libs.insert(libs.end(), spec.partsPaths.begin(), spec.partsPaths.end());
  for (const auto &lib : libs) readPartsLibrary(lib, run.files, design->parts, run.diags);

  if (!spec.layoutPath.empty()) {
    Layout layout;
    if (readLayout(spec.layoutPath, run.files, layout, run.diags)) design->layout = std::move(layout);
  }

  resolveParts(design->circuit, design->parts, spec.assign, {project.file, 0, 0},
               spec.fieldPath + ".assign", run.diags);
  run.designs.push_back(std::move(design));
}

bool loadRunInputs(const InputSelection &sel, RunInputs &run) {
  Project &project = run.project;
  if (!sel.netlistPath.empty()) {
    // One design given directly: the netlist's folder plays the project root.
    DesignSpec spec;
    spec.name = fs::path(sel.netlistPath).stem().string();
    spec.netlistPath = sel.netlistPath;
    spec.layoutPath = sel.layoutPath;
    spec.partsPaths = sel.partsPaths;
    spec.fieldPath = "design";
    if (!sel.operatingPath.empty()) readOperatingPoint(sel.operatingPath, run.files, spec.operating, run.diags);
    project.rootDir = absoluteFolderOf(sel.netlistPath);
    project.designs.push_back(spec);
  } else {
    std::string path = sel.projectPath;
    if (path.empty()) {
      auto found = findProjectFile(fs::current_path().string());
      if (!found) {
        run.diags.error({}, "no project file gateloop.json in this folder or any folder above it; "
                            "name one, or give a design with --netlist");
        return false;
      }
      path = *found;
    } else if (fs::is_directory(path)) {
      path = (fs::path(path) / "gateloop.json").string();
    }
    run.projectDisplayPath = path;
    if (!readProject(path, run.files, project, run.diags)) return false;
  }

  for (const auto &spec : project.designs) loadDesign(spec, project, sel, run);
  return !run.diags.hasErrors();
}

} // namespace gateloop
