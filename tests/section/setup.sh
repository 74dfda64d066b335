#!/usr/bin/env bash
# Installs the section library used by the integration test `verification::section` (the
# fibre moment-curvature cross-check of the wall yield curvature, tests/section/wall_phi_y.py)
# into a local virtual environment, target/pyenv, with the pinned versions of
# tests/section/requirements.txt. Idempotent: does nothing when that environment already
# imports the pinned concreteproperties. Needs python3 (3.11 or newer) with its venv module
# and pip access to PyPI.
#
# concreteproperties 0.8.0 requires Python >= 3.12; the machine has 3.11, so 0.7.0 (the last
# release for 3.11) is pinned.
set -euo pipefail
cd "$(dirname "$0")/../.."
VENV=target/pyenv
WANT=$(sed -n 's/^concreteproperties==//p' tests/section/requirements.txt)
if [ -x "$VENV/bin/python" ] && "$VENV/bin/python" - "$WANT" <<'PY' 2>/dev/null
import sys
from importlib.metadata import version
sys.exit(0 if version("concreteproperties") == sys.argv[1] else 1)
PY
then
    echo "section library: concreteproperties $WANT already in $VENV"
    exit 0
fi
echo "section library: installing concreteproperties $WANT into $VENV"
rm -rf "$VENV"
python3 -m venv "$VENV"
"$VENV/bin/python" -m pip install --quiet --disable-pip-version-check \
    -r tests/section/requirements.txt
"$VENV/bin/python" -c "import concreteproperties; print('section library ready')"
