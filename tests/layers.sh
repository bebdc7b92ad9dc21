#!/bin/sh
# layers.sh LAYER... - check that no file of lib/ includes a header of a
# higher layer. The layers are lib/'s folders, lowest first, as the
# Makefile's LAYERS lists them: a file may include the headers of its own
# folder and of the folders before it, never of one after it, nor the
# umbrella lib/opwin.h (for programs). cli/ includes its own headers and the
# public ones (ow_*.h, opwin.h) only. Run from the repository root; prints
# each include that breaks this and exits 1 when there is one.
for l in "$@"; do
	[ -d "lib/$l" ] || { echo "layers: no folder lib/$l" >&2; exit 2; }
done
i=0
for l in "$@"; do
	for f in lib/"$l"/*.c lib/"$l"/*.h; do
		[ -f "$f" ] || continue
		case $f in *.h) echo "H ${f##*/} $i $l" ;; esac
		sed -n "s|^[[:space:]]*#[[:space:]]*include[[:space:]]*\"\([^\"]*\)\".*|I $f $i $l \1|p" "$f"
	done
	i=$((i + 1))
done | awk -v n_layers="$#" '
$1 == "H" {
	if ($2 in rank) {
		print "layers: " $2 " is in lib/" layer[$2] " and lib/" $4
		bad++
	}
	rank[$2] = $3; layer[$2] = $4; headers++
	next
}
{ inc[++n] = $0 }
END {
	for (k = 1; k <= n; k++) {
		split(inc[k], a, " ")
		if (a[5] == "opwin.h") {
			print a[2] ": includes the umbrella opwin.h (for programs)"
			bad++
		} else if ((a[5] in rank) && rank[a[5]] > a[3]) {
			print a[2] ": includes " a[5] " of lib/" layer[a[5]] \
			    ", a layer above lib/" a[4]
			bad++
		}
	}
	if (bad) {
		print "layers: " bad " include(s) point up" > "/dev/stderr"
		exit 1
	}
	print "layers: " n " includes in " n_layers " folders, none points up"
}' || exit 1
for f in cli/*.c cli/*.h; do
	sed -n 's|^[[:space:]]*#[[:space:]]*include[[:space:]]*"\([^"]*\)".*|\1|p' "$f" |
	while read -r h; do
		case $h in
		opwin.h | ow_*.h) ;;
		*) [ -f "cli/$h" ] || echo "$f: includes $h, not a public header" ;;
		esac
	done
done | awk '{ print } END { if (NR) { print "layers: cli/ reaches inside the library" > "/dev/stderr"; exit 1 } }'
