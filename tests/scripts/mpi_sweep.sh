#!/usr/bin/env bash
# A sweep spread over two MPI ranks gives the same table as one process. Exit 77 (skipped) when
# the executable was built without MPI or mpirun is missing.
set -euo pipefail
exe=$1 source=$2 work=$3
command -v mpirun >/dev/null || { echo "mpirun not installed: skipped"; exit 77; }
rm -rf "$work" && mkdir -p "$work"
args=(sweep "$source/cases/pilot-300L.toml" --vary operation.speed=300:500:3 --vary operation.gas_flow=0.5:1.5:2
      --set grid.radial=5 --set grid.axial=14 --threads 1)
"$exe" "${args[@]}" --out "$work/single" >/dev/null
# As root, Open MPI needs explicit consent; --oversubscribe lets two ranks share fewer cores.
mpirun --allow-run-as-root --oversubscribe -np 2 "$exe" "${args[@]}" --out "$work/ranks" > "$work/ranks.log" 2>&1
grep -q "on rank 0 of 2" "$work/ranks.log" || { echo "not run on 2 ranks (built without MPI?): skipped"; exit 77; }
if cmp -s "$work/single/sweep.csv" "$work/ranks/sweep.csv"; then
  echo "1 passed, 0 failed: mpirun -np 2 sweep.csv is identical to the single-process one"
  rm -rf "$work"
else
  diff "$work/single/sweep.csv" "$work/ranks/sweep.csv" | head
  echo "0 passed, 1 failed"
  exit 1
fi
