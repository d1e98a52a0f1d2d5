#!/usr/bin/env bash
# Registers the TypeScript notebook kernel (tslab, a dev dependency) in a project-local Jupyter
# folder, .jupyter-local/, touching nothing global. Prints the line to export so Jupyter finds it.
set -euo pipefail
cd "$(dirname "$0")/.."
root=$(pwd)
# Debian's Jupyter lives with /usr/bin/python3; the first python3 on PATH may be another one.
python=${BOLDSWEEP_JUPYTER_PYTHON:-/usr/bin/python3}
node_modules/.bin/tslab install --python="$python" --prefix "$root/.jupyter-local" --binary "$root/node_modules/.bin/tslab" >/dev/null
node scripts/link-self.mjs
echo "export JUPYTER_PATH=$root/.jupyter-local/share/jupyter"
