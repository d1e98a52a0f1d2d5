#!/usr/bin/env bash
# Executes every notebook in notebooks/ headless with a project-local tslab kernel (no global
# Jupyter state is touched) and writes out/notebooks/results.json: [{notebook, ok}].
set -uo pipefail
cd "$(dirname "$0")/.."
root=$(pwd)
prefix="$root/.jupyter-local"
mkdir -p out/notebooks
bash scripts/register-kernel.sh >/dev/null || { echo "notebook kernel registration failed"; echo '[]' > out/notebooks/results.json; exit 1; }
export JUPYTER_PATH="$prefix/share/jupyter"
export JUPYTER_DATA_DIR="$root/.jupyter-local/data" JUPYTER_RUNTIME_DIR="$root/.jupyter-local/runtime" JUPYTER_CONFIG_DIR="$root/.jupyter-local/config"
results="["
sep=""
status=0
for nb in notebooks/*.ipynb; do
  name=$(basename "$nb" .ipynb)
  echo "executing $nb"
  if (cd notebooks && /usr/bin/python3 -m jupyter nbconvert --to notebook --execute --ExecutePreprocessor.timeout=1200 \
        --ExecutePreprocessor.kernel_name=tslab "$(basename "$nb")" --output "$root/out/notebooks/$name.ipynb") >"out/notebooks/$name.log" 2>&1; then
    ok=true
  else
    ok=false; status=1; tail -30 "out/notebooks/$name.log"
  fi
  results="$results$sep{\"notebook\":\"$nb\",\"ok\":$ok}"
  sep=","
done
echo "$results]" > out/notebooks/results.json
exit $status
