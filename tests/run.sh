#!/bin/sh
# Run every test binary given; report each failure; exit non-zero if any
# failed. Ends with the plain "N passed, N failed" line.
pass=0; fail=0; failed=""
for t in "$@"; do
	if "$t"; then pass=$((pass + 1)); else
		fail=$((fail + 1)); failed="$failed $(basename "$t")"
	fi
done
[ -n "$failed" ] && echo "failed test programs:$failed"
echo "tests: $pass passed, $fail failed"
[ "$fail" -eq 0 ]
