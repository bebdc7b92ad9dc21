#!/bin/sh
# run.sh OUT SECONDS NAME... - run each libFuzzer target OUT/fuzz_NAME for
# SECONDS, its corpus grown in OUT/corpus-NAME from seeds taken from the
# project's own inputs (fixtures/, tests/bad/, tests/data/, demo/). Stops
# at the first finding: its input is kept as OUT/crash-*, leak-* or
# timeout-*, and the fuzzer's log is shown.
set -e
out=$1; secs=$2; shift 2
seeds=$out/seeds; work=$out/work
rm -rf "$seeds" "$work"
mkdir -p "$seeds/study" "$seeds/units" "$seeds/csv" "$work/study"

# study: every JSON input; the part files they name, laid out around the
# folder the target writes its input into
for f in fixtures/studies/*.json tests/data/*.json tests/bad/*.json demo/*.json; do
	cp "$f" "$seeds/study/"
done
cp -r tests/bad/parts "$work/study/parts"
cp tests/data/parts/* "$work/study/parts/" 2>/dev/null || true
cp demo/*.json "$work/study/"
cp -r fixtures/screws fixtures/resins "$work/"
mkdir -p "$work/bad" && cp -r tests/bad/parts "$work/bad/"
# units: every quantity written in those files
n=0
grep -ohE '"[-+]?[0-9][^"]{0,80}"' fixtures/*/*.json tests/bad/*.json \
    tests/data/*.json demo/*.json 2>/dev/null | tr -d '"' | sort -u |
while IFS= read -r q; do
	n=$((n + 1)); printf '%s' "$q" > "$seeds/units/q$n"
done
# csv: the lab tables
for f in tests/bad/lab/*.csv $(find fixtures tests/data demo -name '*.csv'); do
	cp "$f" "$seeds/csv/"
done

for name in "$@"; do
	mkdir -p "$out/corpus-$name"
	log=$out/fuzz-$name.log
	if OPWIN_FUZZ_DIR=$(cd "$work/study" && pwd) \
	   "$out/fuzz_$name" -max_total_time="$secs" -timeout=10 \
	   -rss_limit_mb=2048 -max_len=65536 -print_final_stats=1 \
	   -artifact_prefix="$out/" "$out/corpus-$name" "$seeds/$name" \
	   >"$log" 2>&1; then
		runs=$(sed -n 's/^stat::number_of_executed_units: *//p' "$log")
		echo "fuzz $name: ${runs:-?} runs in $secs s, no finding"
	else
		tail -n 60 "$log"
		echo "fuzz $name: FINDING (input saved under $out/, log $log)"
		exit 1
	fi
done
