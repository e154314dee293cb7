/// \file
/// The project file (`gateloop/1`): which designs to check, with which parts, layout, operating
/// point, rule parameters and waivers.
#pragma once

#include "checker/core/source_location.h"
#include "checker/core/units.h"

#include <nlohmann/json.hpp>

#include <map>
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace gateloop {

/// The operating point a design is checked at.
struct OperatingPoint {
  std::optional<Volt> vBus;
  std::optional<Ampere> iLoad;
  std::optional<Hertz> fSw;
  std::optional<Celsius> tAmbient;
  std::optional<Henry> lPowerLoop;
  std::optional<Volt> driveVOn, driveVOff;   ///< override the driver part's rails
  std::optional<VoltPerSecond> dvDt;         ///< partner switching slope for miller-bounce
  std::optional<AmperePerSecond> diDt;       ///< turn-off slope for turnoff-overshoot
  /// Inductance per metre assumed for a net whose layout gives only a length or nothing.
  std::optional<HenryPerMeter> assumedInductancePerLength;
  /// Length assumed for a gate-loop net the layout does not mention at all.
  std::optional<Meter> assumedLength;
};

struct DesignSpec {
  std::string name;
  std::string netlistPath;               ///< absolute or relative to the current directory
  std::string layoutPath;                ///< empty when none
  std::vector<std::string> partsPaths;   ///< extra libraries for this design
  std::vector<std::pair<std::string, std::string>> assign; ///< glob -> part id, in file order
  OperatingPoint operating;
  std::string fieldPath;                 ///< "designs[0]"
};

struct Waiver {
  std::string rule;
  std::string loopGlob;
  std::string reason;
  std::string until;                     ///< "YYYY-MM-DD" or empty
  std::string fieldPath;                 ///< "waivers[0]"
};

struct Project {
  FileId file = 0;                       ///< 0 when the design was given on the command line
  std::string rootDir;                   ///< folder of the project file (or of the netlist)
  std::vector<std::string> partsPaths;
  std::vector<DesignSpec> designs;
  /// Raw parameters per rule id (`rules.<id>`), validated by the rule that owns them.
  std::map<std::string, nlohmann::json> ruleParams;
  std::vector<Waiver> waivers;
};

} // namespace gateloop
