#!/bin/sh
# Mutation review: applies each mutation listed in mutations.tsv to a
# temporary copy of the repository, runs the tests named beside it, and
# reports whether the tests killed the mutation (failed) or let it
# survive (passed). A mutation whose pattern no longer matches is
# reported as "stale". Exits 1 when any mutation survives or is stale.
#
#   testdata/mutation/run.sh            # every mutation
#   testdata/mutation/run.sh er-        # those whose id starts with er-
#
# mutations.tsv: one mutation a line, tab-separated:
#   id  file  package  test-regex  sed-expression
# (lines starting with # are comments). Each test run gets 60 s; a
# mutation that makes the tests hang counts as killed by the timeout.
set -u
here=$(cd "$(dirname "$0")" && pwd)
root=$(cd "$here/../.." && pwd)
filter=${1:-}
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
(cd "$root" && tar --exclude=.git -cf - .) | (cd "$tmp" && tar -xf -)
tab=$(printf '\t')
survived=0
while IFS="$tab" read -r id file pkg tests expr; do
	case "$id" in '' | '#'*) continue ;; esac
	case "$id" in "$filter"*) ;; *) continue ;; esac
	cp "$tmp/$file" "$tmp/$file.orig"
	sed -i "$expr" "$tmp/$file"
	if cmp -s "$tmp/$file" "$tmp/$file.orig"; then
		echo "stale     $id: the pattern does not match $file"
		survived=1
	elif (cd "$tmp" && go test -count=1 -timeout 60s -run "$tests" "$pkg" </dev/null >"$tmp/out.txt" 2>&1); then
		echo "SURVIVED  $id ($file; go test -run '$tests' $pkg passes)"
		survived=1
	else
		echo "killed    $id"
	fi
	mv "$tmp/$file.orig" "$tmp/$file"
done <"$here/mutations.tsv"
exit $survived
