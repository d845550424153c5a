#!/usr/bin/env bash
# Builds the page into the given folder (default web/dist). Filled in by the
# page work; until then it only prepares the folder.
set -euo pipefail
out=${1:-web/dist}
mkdir -p "$out"
