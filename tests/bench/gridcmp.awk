# gridcmp.awk - compare two grid.csv files of the same study (a solver
# change that keeps the physics: speed work, tolerances) point by point.
#   awk -f tests/bench/gridcmp.awk before/grid.csv after/grid.csv
# Rows are matched by (rpm, axis_value); both files must hold the same
# points. Passes (exit 0) when every point keeps its status and every
# figure stays within
#   temperatures (*_C):  0.01 K
#   energy_residual:     1e-6 (a round-off check, not a figure)
#   barrel_heat_kW:      0.01 % of the point's drive power (the net of
#                        zone heats in and out, often near zero, is
#                        judged on the scale of the energy book)
#   everything else:     0.01 % of the larger of the two values, with
#                        values below 1 % of the column's largest
#                        magnitude judged against that 1 % (a figure that
#                        crosses zero has no relative error there).
# Prints, per column, the largest difference and the point where it is;
# with -v verbose=1 also every difference beyond tolerance.
BEGIN {
	FS = ","
	RTOL = 1e-4
	TTOL = 0.01
	FLOOR = 0.01
	bad = 0
}

FNR == 1 {
	if (NR == 1)
		for (i = 1; i <= NF; i++) {
			name[i] = $i
			if ($i == "power_kW")
				ipower = i
		}
	else if ($0 != head) {
		print "gridcmp: the two files have different columns"
		exit 2
	}
	head = $0
	ncol = NF
	next
}

NR == FNR {
	key = $1 "," $2
	row[key] = $0
	for (i = 1; i <= NF; i++)
		if ($i != "" && $i != "nan" && (($i < 0 ? -$i : $i) > colmax[i]))
			colmax[i] = $i < 0 ? -$i : $i
	next
}

{
	key = $1 "," $2
	if (!(key in row)) {
		printf "gridcmp: point %s is only in %s\n", key, FILENAME
		bad++
		next
	}
	seen[key] = 1
	nseen++
	split(row[key], a, ",")
	power = abs($ipower) > abs(a[ipower]) ? abs($ipower) : abs(a[ipower])
	for (i = 1; i <= ncol; i++)
		compare(i, a[i], $i, key)
}

function abs(x) { return x < 0 ? -x : x }

function compare(i, x, y, key,    d, tol, scale) {
	if (name[i] == "status" || x == "" || y == "" || x == "nan" ||
	    y == "nan") {
		if (x != y) {
			printf "gridcmp: %s at %s: \"%s\" -> \"%s\"\n",
			       name[i], key, x, y
			bad++
		}
		return
	}
	d = abs(y - x)
	if (name[i] ~ /_C$/)
		tol = TTOL
	else if (name[i] == "energy_residual")
		tol = 1e-6
	else if (name[i] == "barrel_heat_kW")
		tol = RTOL * power
	else {
		scale = abs(x) > abs(y) ? abs(x) : abs(y)
		if (scale < FLOOR * colmax[i])
			scale = FLOOR * colmax[i]
		tol = RTOL * scale
	}
	if (tol > 0 && d / tol > worst_ratio[i]) {
		worst_ratio[i] = d / tol
		worst_d[i] = d
		worst_at[i] = key
	}
	if (d > tol) {
		bad++
		if (verbose)
			printf "gridcmp: %s at %s: %.17g -> %.17g (%.3g of tol)\n",
			       name[i], key, x, y, d / tol
	}
}

END {
	for (k in row)
		if (!(k in seen)) {
			printf "gridcmp: point %s is only in the first file\n", k
			bad++
		}
	printf "%-24s %14s %10s  %s\n", "column", "largest diff", "of tol", "at rpm,axis"
	for (i = 3; i <= ncol; i++)
		if (name[i] != "status")
			printf "%-24s %14.4g %10.3f  %s\n", name[i], worst_d[i],
			       worst_ratio[i], worst_at[i]
	printf "gridcmp: %d point(s) compared, %d difference(s) beyond tolerance\n", nseen, bad
	exit bad > 0
}
