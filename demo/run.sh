#!/bin/sh
# demo/run.sh - run the invented demo scenario (Line 3 of an imaginary
# irrigation-pipe workshop) end to end into demo/out/.
# Usage: sh demo/run.sh PATH/TO/opwin      (`make demo` passes build/opwin)
set -e

opwin=${1:?usage: sh demo/run.sh PATH/TO/opwin}
here=$(dirname "$0")
out="$here/out"
mkdir -p "$out"

echo "== the line, checked in SI and in US units"
"$opwin" check "$here/study-si.json"
"$opwin" check "$here/study-us.json" --units us --json > "$out/check-us.json"

echo "== one operating point: 60 rpm, the study's own set-points"
"$opwin" point "$here/study-si.json" --rpm 60 --profile "$out/profile-60rpm.csv"

echo "== the operating window"
"$opwin" map "$here/study-si.json" -o "$out/window" --refine 1

echo "== the demo screw new and worn, on one grid"
"$opwin" compare "$here/study-si.json" "$here/compare-study-worn.json" \
	-o "$out/compare" --grid 21x21 --label-a new --label-b worn

echo "== the demo resin refitted from (invented) lab data"
"$opwin" fit "$here/lab/hdpe-pipe-lab.csv" -o "$out/fitted-viscosity.json" \
	--plot "$out/fit.png"

echo "== the model calibrated to the line's (invented) readings, and its window"
"$opwin" calibrate "$here/study-si.json" "$here/line/line3-readings.csv" \
	--free viscosity_scale,die_factor -o "$out/study-calibrated.json" \
	--plot "$out/calibration.png"
"$opwin" map "$out/study-calibrated.json" -o "$out/window-calibrated"

echo "demo outputs are in $out/"
