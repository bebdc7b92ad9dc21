#!/bin/sh
# demo/run.sh - run the invented demo scenario (Line 3 of an imaginary
# irrigation-pipe workshop) end to end.
# Usage: sh demo/run.sh PATH/TO/opwin      (`make demo` passes build/opwin)
set -e

opwin=${1:?usage: sh demo/run.sh PATH/TO/opwin}
here=$(dirname "$0")

# The same line written twice, in SI and in US units: both must load.
"$opwin" check "$here/study-si.json"
"$opwin" check "$here/study-us.json" --units us
