#!/usr/bin/env bash
# Installs oxystrat from BUILD_DIR into WORK/prefix, builds tests/consumer against it with
# find_package(oxystrat), runs it on the demo case and compares its DO min with `oxystrat run`'s.
# Usage: consumer.sh SOURCE_DIR BUILD_DIR WORK
set -euo pipefail
src=$1 build=$2 work=$3
rm -rf "$work" && mkdir -p "$work"
cmake --install "$build" --prefix "$work/prefix" >/dev/null
cmake -S "$src/tests/consumer" -B "$work/build" -G Ninja -DCMAKE_BUILD_TYPE=Release \
      -DCMAKE_PREFIX_PATH="$work/prefix" >/dev/null
cmake --build "$work/build" >/dev/null
got=$("$work/build/lowest_do" "$src/cases/tall-3rushton.toml")
echo "consumer: $got"
"$work/prefix/bin/oxystrat" run "$src/cases/tall-3rushton.toml" --out "$work/run" >/dev/null
want=$(/usr/bin/python3 -c "import h5py,sys; print('DO min %.6g mol/m3' % h5py.File(sys.argv[1])['summary/do_min'][()])" "$work/run/result.h5")
echo "oxystrat run: $want"
[ "$got" = "$want" ]
