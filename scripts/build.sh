#!/usr/bin/env bash
# Builds the Lixiv notebook page into a folder (default web/dist):
#  1. vugugen turns web/*.vugu into web/*_gen.go (committed, refreshed here);
#  2. the page wasm (wasm/), engine and page together; the same module runs
#     on the page's Web Workers (web/static/worker.js), which compute;
#  3. wasm_exec.js from the Go that built them, vugu's renderer helper, the
#     static files of web/static and the demo budget from examples/;
#  4. sw.js stamped with a hash of everything, so a new build refreshes the
#     offline cache;
#  5. every file's brotli and gzip twins for the server (web/cmd/compress),
#     which then prints the page's first-load weight and fails the build when
#     it passes 2 MB.
set -euo pipefail
cd "$(dirname "$0")/.."
out=${1:-web/dist}
GO=${GO:-go}

"$GO" tool vugugen -skip-go-mod -skip-main ./web
gofmt -w web/*_gen.go

rm -rf "$out.tmp"
mkdir -p "$out.tmp"
# LIXIV_TAGS=timing builds the page with the timing harness's probes (make browser-timing);
# LIXIV_NAMES=1 keeps the module's function names, for a profile (make browser-profile;
# the module is then over the weight limit, so such a page is for measuring only).
ldflags="-s -w"
if [ -n "${LIXIV_NAMES:-}" ]; then ldflags=""; fi
GOOS=js GOARCH=wasm "$GO" build -trimpath -tags "${LIXIV_TAGS:-}" -ldflags="$ldflags" -o "$out.tmp/main.wasm" ./wasm

cp "$("$GO" env GOROOT)/lib/wasm/wasm_exec.js" "$out.tmp/"
vugu=$("$GO" list -m -f '{{.Dir}}' github.com/vugu/vugu)
"$GO" run ./web/cmd/vugujs "$vugu/domrender/renderer-js-script.go" >"$out.tmp/vugu-render.js"
cp web/static/* "$out.tmp/"

# The demo budget: the first budget file in examples/ whose folder or name
# says demo, else the first budget file found.
demo=$(find examples -type f -name '*.lixiv.json' 2>/dev/null | sort | grep -i -m1 'corrie\|demo' || true)
[ -n "$demo" ] || demo=$(find examples -type f -name '*.lixiv.json' 2>/dev/null | sort | head -n1 || true)
if [ -n "$demo" ]; then
	cp "$demo" "$out.tmp/demo.lixiv.json"
else
	echo "build: no budget file in examples/; the page starts with an empty budget" >&2
	printf '' >"$out.tmp/demo.lixiv.json"
fi

version=$(cd "$out.tmp" && cat $(ls | sort) | sha256sum | cut -c1-16)
sed -i "s/^const VERSION = \".*\";/const VERSION = \"$version\";/" "$out.tmp/sw.js"
limit=2000000
if [ -n "${LIXIV_NAMES:-}" ]; then limit=100000000; fi
"$GO" run ./web/cmd/compress -limit "$limit" "$out.tmp"

rm -rf "$out"
mv "$out.tmp" "$out"
printf 'build: %s (version %s)\n' "$out" "$version"
