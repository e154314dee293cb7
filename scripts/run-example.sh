#!/usr/bin/env bash
# One command: install what is missing, build, and check the bundled three-phase inverter example.
set -euo pipefail
cd "$(dirname "$0")/.."
scripts/setup.sh
scripts/build.sh
echo
echo "== gateloop check examples/inverter-3ph =="
status=0
build/gateloop check examples/inverter-3ph/gateloop.json || status=$?
echo
echo "(exit status $status: 0 clean, 1 findings at or above the fail level, 2 input error;"
echo " this example has deliberate faults, so 1 is expected)"
[ "$status" -le 1 ]
