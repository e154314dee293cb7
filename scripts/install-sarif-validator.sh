#!/usr/bin/env bash
# Installs the SARIF SDK multitool (npm package @microsoft/sarif-multitool) into a project-local
# folder, so tests/sarif_validation_test.cpp can validate gateloop's SARIF output.
#
#   scripts/install-sarif-validator.sh            # installs into <repo>/.tools/sarif
#   scripts/install-sarif-validator.sh --global   # npm install -g instead
#
# The npm package ships a self-contained native Linux build (a dependency package for the
# platform), so no separate .NET runtime is needed. The folder .tools/ is not committed.
set -euo pipefail

version="5.7.0"   # pinned so CI validates against the same tool version every run
repo_root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
prefix="${repo_root}/.tools/sarif"

if ! command -v npm >/dev/null 2>&1; then
  echo "install-sarif-validator: npm not found; install Node.js and npm first (Debian: apt-get install -y npm)" >&2
  exit 1
fi

if [[ "${1:-}" == "--global" ]]; then
  npm install -g --no-fund --no-audit "@microsoft/sarif-multitool@${version}"
  tool="$(command -v sarif-multitool)"
else
  mkdir -p "${prefix}"
  npm install --prefix "${prefix}" --no-fund --no-audit --no-save "@microsoft/sarif-multitool@${version}"
  tool="${prefix}/node_modules/.bin/sarif-multitool"
fi

# The platform package marks its binary executable in a postinstall script, which newer npm
# releases may skip; do it here so the result does not depend on the npm version.
npm_root="$(dirname "$(dirname "$(readlink -f "${tool}")")")"
native="${npm_root}/sarif-multitool-linux/Sarif.Multitool"
if [[ -f "${native}" ]]; then chmod u+x "${native}"; fi

# A smoke run: the tool must start on this machine (it is a native binary for linux-x64).
if ! "${tool}" --version >/dev/null 2>&1 && ! "${tool}" validate --help >/dev/null 2>&1; then
  echo "install-sarif-validator: ${tool} was installed but does not run on this machine" >&2
  exit 1
fi
echo "sarif-multitool installed: ${tool}"
