#!/bin/sh
# Mutation run: apply each single mutation of tests/mutate/mutations to a
# copy of the source tree, rebuild, run the test programs the record names
# (or every test program with --all-tests), and count the mutations the
# tests catch (a test program fails, or the build fails).
#
#   sh tests/mutate/run.sh [--all-tests] [--only ID] [TREE]
#
# TREE (default: this checkout) is the tree whose tests are judged; the
# mutation list always comes from this checkout. Test programs a record
# names that TREE lacks are skipped; with none left, every test program
# of TREE runs. The copy lives under ${TMPDIR:-/tmp}; TREE is never touched.
set -u
here=$(cd "$(dirname "$0")/../.." && pwd)
list="$here/tests/mutate/mutations"
all=0
only=""
while [ $# -gt 0 ]; do
	case "$1" in
	--all-tests) all=1 ;;
	--only) shift; only="$1" ;;
	-*) echo "usage: run.sh [--all-tests] [--only ID] [TREE]" >&2; exit 2 ;;
	*) break ;;
	esac
	shift
done
tree=$(cd "${1:-$here}" && pwd)
work=$(mktemp -d "${TMPDIR:-/tmp}/opwin-mutate.XXXXXX")
trap 'rm -rf "$work"' EXIT INT TERM
jobs=${MUTATE_JOBS:-2}
tmo=${MUTATE_TIMEOUT:-300}

echo "mutate: copying $tree to $work"
if git -C "$tree" rev-parse --git-dir >/dev/null 2>&1; then
	(cd "$tree" && git ls-files -co --exclude-standard | tar -cf - -T -)
else
	(cd "$tree" && tar -cf - --exclude=./build --exclude=./build-san \
		--exclude=./lib/libopwin.a .)
fi | (cd "$work" && tar -xf -)
cd "$work" || exit 1
echo "mutate: building the unmutated tree"
progs=$(ls tests/test_*.c | sed 's|^tests/\(.*\)\.c$|build/tests/\1|')
if ! make -s -j"$jobs" all $progs >build.log 2>&1; then
	cat build.log; echo "mutate: the unmutated tree does not build"; exit 1
fi
# The programs the list names (all of them with --all-tests) must pass on
# the unmutated tree, or a failure would count as a catch.
used=$progs
if [ $all = 0 ]; then
	used=""
	for t in $(grep -v '^#' "$list" | awk 'NF { print $3 }' | tr ',' '\n' |
		   sort -u); do
		[ -f "tests/$t.c" ] && used="$used build/tests/$t"
	done
	[ -z "$used" ] && used=$progs
fi
for p in $used; do
	if ! OPWIN=build/opwin timeout "$tmo" "$p" >/dev/null 2>&1; then
		echo "mutate: $p fails on the unmutated tree"; exit 1
	fi
done

total=0 caught=0 equiv=0 accepted=0 unexpected=0 bad=0
survivors=""
note=""
while IFS= read -r line; do
	case "$line" in
	'# ----'*) note=""; continue ;;
	'#'*) note="${note}${line#\#}
"; continue ;;
	'') note=""; continue ;;
	esac
	set -f
	# shellcheck disable=SC2086
	set -- $line
	set +f
	id=$1 file=$2 tests=$3 expect=$4
	script=$(printf '%s\n' "$line" |
		sed 's/^[^ ]*  *[^ ]*  *[^ ]*  *[^ ]*  *//')
	[ -n "$only" ] && [ "$only" != "$id" ] && { note=""; continue; }
	cp "$file" "$work/orig.c"
	if ! sed -e "$script" "$work/orig.c" >"$file" ||
	   cmp -s "$file" "$work/orig.c"; then
		echo "NOT APPLIED  $id ($file: the pattern does not match)"
		cp "$work/orig.c" "$file"
		bad=$((bad + 1)); note=""; continue
	fi
	run=""
	if [ $all = 0 ]; then
		for t in $(echo "$tests" | tr ',' ' '); do
			[ -f "tests/$t.c" ] && run="$run build/tests/$t"
		done
	fi
	[ -z "$run" ] && run=$progs
	total=$((total + 1))
	verdict=survived
	if ! make -s -j"$jobs" all $run >build.log 2>&1; then
		verdict="caught (build)"
	else
		for p in $run; do
			if ! OPWIN=build/opwin timeout "$tmo" "$p" \
				>/dev/null 2>&1; then
				verdict="caught ($(basename "$p"))"
				break
			fi
		done
	fi
	cp "$work/orig.c" "$file"
	touch "$file"
	case "$verdict" in
	caught*) caught=$((caught + 1)) ;;
	*)
		case "$expect" in
		equivalent) equiv=$((equiv + 1)) ;;
		accepted) accepted=$((accepted + 1)) ;;
		*) unexpected=$((unexpected + 1)); expect="NOT EXPLAINED" ;;
		esac
		survivors="${survivors}  $id [$expect]
$(printf '%s' "$note" | sed 's/^/     /')
" ;;
	esac
	printf '%-34s %s\n' "$id" "$verdict"
	note=""
done <"$list"

echo
if [ -n "$survivors" ]; then
	echo "survivors:"
	printf '%s' "$survivors"
fi
[ $bad -gt 0 ] && echo "mutations that did not apply: $bad"
if [ $total -gt 0 ]; then
	echo "mutate: $caught of $total caught ($((100 * caught / total)) %);" \
	     "survivors: $equiv equivalent, $accepted accepted," \
	     "$unexpected not explained"
fi
[ $unexpected -eq 0 ] && [ $bad -eq 0 ]
