#!/usr/bin/env bash
# Runs every Fuzz target in the engine and the page package for the given time each.
set -euo pipefail
t=${1:-3s}
# Go minimises every new interesting input for up to a minute by default,
# and a short run that ends mid-minimisation fails with "context deadline
# exceeded". Short runs cap minimisation by count; long runs keep the default.
m=${FUZZ_MINIMIZE:-200x}
for pkg in $(go list ./engine/... ./web/...); do
  for f in $(go test -list '^Fuzz' "$pkg" 2>/dev/null | grep '^Fuzz' || true); do
    echo "fuzz $pkg $f ($t)"
    go test -run '^$' -fuzz "^${f}\$" -fuzztime "$t" -fuzzminimizetime "$m" "$pkg" >/tmp/lixiv-fuzz.log 2>&1 || { cat /tmp/lixiv-fuzz.log; exit 1; }
  done
done
