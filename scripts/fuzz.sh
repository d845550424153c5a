#!/usr/bin/env bash
# Random exploration of every fuzz target in the repository (`make fuzz`).
#
# The total time, FUZZ_TOTAL (default 10m; a number of seconds or a number
# followed by s, m or h), is shared equally among the targets, at least
# FUZZ_MIN_EACH seconds (default 10) each. Minimisation of a new input is
# bounded by FUZZ_MINIMIZE (default 10s) and each target's run by a hard
# timeout, so a run always ends. A failing input is written by Go under the
# package's testdata/fuzz/<Target>/, where plain `go test` replays it from
# then on: commit it with the fix. The summary at the end lists every
# target, what it found, and the new files under testdata/fuzz.
#
# `make test` never runs this: it replays the seed corpora and the committed
# findings only, so its outcome does not depend on luck.
set -uo pipefail
cd "$(dirname "$0")/.."

seconds() { # 10m -> 600
  local v=$1
  case $v in
    *h) echo $(( ${v%h} * 3600 )) ;;
    *m) echo $(( ${v%m} * 60 )) ;;
    *s) echo "${v%s}" ;;
    *) echo "$v" ;;
  esac
}
total=$(seconds "${FUZZ_TOTAL:-10m}")
min_each=${FUZZ_MIN_EACH:-10}
minimize=${FUZZ_MINIMIZE:-10s}
log_dir=${FUZZ_LOG_DIR:-/tmp/lixiv-fuzz}
mkdir -p "$log_dir"

# Every fuzz target: "package target" lines, from one listing of all
# packages (packages that do not build natively, such as wasm/, list none).
targets=()
pkg_targets=$(go test -list '^Fuzz' ./... 2>/dev/null | awk '
  /^Fuzz/ { t[n++] = $1; next }
  /^ok / { for (i = 0; i < n; i++) print $2, t[i]; n = 0 }')
while read -r pkg f; do
  [ -n "$pkg" ] && targets+=("$pkg $f")
done <<<"$pkg_targets"
n=${#targets[@]}
if [ "$n" -eq 0 ]; then
  echo "fuzz: no fuzz targets found" >&2
  exit 1
fi
each=$(( total / n ))
[ "$each" -lt "$min_each" ] && each=$min_each
echo "fuzz: $n targets, ${each}s each ($(( each * n / 60 )) min in all; FUZZ_TOTAL=${FUZZ_TOTAL:-10m})"

before=$(git ls-files --others --exclude-standard -- '*/testdata/fuzz/*' | sort)
summary=()
failed=0
cut_short=0
for pf in "${targets[@]}"; do
  read -r pkg f <<<"$pf"
  log="$log_dir/$(echo "$pkg" | tr / _)-$f.log"
  start=$(date +%s)
  # The hard limit leaves room for the last minimisation and for building.
  timeout --kill-after=30s $(( each + $(seconds "$minimize") + 180 )) \
    go test -run '^$' -fuzz "^${f}\$" -fuzztime "${each}s" -fuzzminimizetime "$minimize" "$pkg" >"$log" 2>&1
  rc=$?
  took=$(( $(date +%s) - start ))
  execs=$(grep -o 'execs: [0-9]*' "$log" | tail -1 | cut -d' ' -f2)
  interesting=$(grep -o 'new interesting: [0-9]*' "$log" | tail -1 | cut -d' ' -f3)
  case $rc in
    0) status="ok" ;;
    124|137) status="HUNG"; failed=$((failed + 1)) ;;
    *)
      # Go's fuzzing can end a run at its deadline with a bare "context
      # deadline exceeded" (its timer cancels the run a moment before the
      # workers' context): no input failed and none is written, so it is not
      # a finding.
      if grep -q 'context deadline exceeded' "$log" && ! grep -qE 'Failing input|failure while testing seed corpus|panic:' "$log"; then
        status="ok*"; cut_short=$((cut_short + 1))
      else
        status="FAILED"; failed=$((failed + 1))
      fi ;;
  esac
  line="$(printf '%-9s %-34s %-22s %4ss  %8s execs  %4s new corpus entries' "$status" "$pkg" "$f" "$took" "${execs:-0}" "${interesting:-0}")"
  echo "$line"
  summary+=("$line")
  if [ "$status" = FAILED ] || [ "$status" = HUNG ]; then
    grep -E -- '--- FAIL|Failing input|failure while testing seed corpus|panic|^\s+[a-z_]+\.go:[0-9]+' "$log" | head -20 | sed 's/^/    /'
    summary+=("    log: $log")
  fi
done

after=$(git ls-files --others --exclude-standard -- '*/testdata/fuzz/*' | sort)
found=$(comm -13 <(echo "$before") <(echo "$after") | sed '/^$/d')
echo
echo "fuzz summary: $n targets, ${each}s each, $failed failing"
printf '%s\n' "${summary[@]}"
if [ "$cut_short" -gt 0 ]; then
  echo "ok*: Go ended the run at its deadline with a bare \"context deadline exceeded\"; no input failed."
fi
if [ -n "$found" ]; then
  echo "new findings (commit them as regression inputs with their fix):"
  echo "$found" | sed 's/^/  /'
else
  echo "new findings: none"
fi
[ "$failed" -eq 0 ]
