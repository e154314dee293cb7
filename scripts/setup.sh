#!/usr/bin/env bash
# Installs what gateloop needs on a Debian machine, only where it is missing. Safe to run again.
set -euo pipefail

packages=(build-essential cmake pkg-config libpugixml-dev libboost-graph-dev nlohmann-json3-dev libcli11-dev
          libfmt-dev libgtest-dev googletest ngspice)
# npm fetches the SARIF validator for the tests; a machine with Node.js already has it.
command -v npm >/dev/null 2>&1 || packages+=(npm)
missing=()
for p in "${packages[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if ((${#missing[@]})); then
  echo "setup: installing ${missing[*]}"
  sudo_cmd=""
  [ "$(id -u)" -ne 0 ] && sudo_cmd="sudo"
  $sudo_cmd apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $sudo_cmd apt-get install -y -qq "${missing[@]}" >/dev/null
fi
