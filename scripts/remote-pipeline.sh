#!/usr/bin/env bash
# An example build step against a running Framewright (docs/cli.md, "Remote use"): pull a published
# revision of a map, lint it, generate C for firmware and compile it, upload a capture and download
# its decoded CSV — every step a command line call with an access token.
#
#   FRAMEWRIGHT_TOKEN=fwt_… scripts/remote-pipeline.sh SERVER MAP REVISION CAPTURE.csv OUT_DIR
#
# MAP is the map's name or id, REVISION a number (3 for r3). OUT_DIR receives map.json, lint.json,
# c/fw.h, c/fw.c, c/fw.o, capture.json and decoded.csv. Stops at the first failing step.
set -euo pipefail

if [ $# -ne 5 ]; then
	echo "usage: FRAMEWRIGHT_TOKEN=… $0 SERVER MAP REVISION CAPTURE.csv OUT_DIR" >&2
	exit 2
fi
server=$1
map=$2
revision=$3
capture=$(realpath "$4")
mkdir -p "$5"
out=$(realpath "$5")

cd "$(dirname "$0")/.."
cli() { npm run -s cli -- "$@"; }

cli pull --server "$server" --map "$map" --revision "$revision" --out "$out/map.json" >"$out/pull.json"
cli lint --server "$server" --map "$map" --revision "$revision" >"$out/lint.json"
cli codegen --map "$out/map.json" --out "$out/c" --prefix fw --revision "r$revision" >"$out/codegen.json"
gcc -std=c99 -Wall -Wextra -Werror -c "$out/c/fw.c" -o "$out/c/fw.o"
cli upload --server "$server" "$capture" >"$out/capture.json"
capture_id=$(node -p 'JSON.parse(require("fs").readFileSync(process.argv[1], "utf8")).capture.id' "$out/capture.json")
cli decode --server "$server" --map "$map" --revision "$revision" --out "$out/decoded.csv" "$capture_id"
echo "pipeline done: $out" >&2
