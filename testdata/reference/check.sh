#!/bin/sh
# Regenerates the reference inputs and values into a temporary folder and
# fails if they differ from the committed ones (testdata/reference/).
# Needs Debian's python3-numpy, python3-pandas and python3-scipy.
set -eu
here=$(cd "$(dirname "$0")" && pwd)
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
/usr/bin/python3 "$here/gen_stats.py" --out "$tmp"
status=0
for f in stats_reference.json inputs/returns.csv inputs/assets.csv inputs/prices.csv inputs/securities.csv inputs/pe.csv; do
	if ! diff -u "$here/$f" "$tmp/$f" >"$tmp/diff.txt"; then
		echo "reference check: $f differs from a fresh run of gen_stats.py:" >&2
		head -n 40 "$tmp/diff.txt" >&2
		status=1
	fi
done
if [ "$status" -eq 0 ]; then
	echo "reference check: stats_reference.json and inputs reproduce exactly"
fi
exit "$status"
