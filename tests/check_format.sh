#!/bin/sh
# Every C++ source and header of the tree follows .clang-format (clang-format 14, as Debian 12
# ships it). Fix a failure with: clang-format -i FILE (or over `git ls-files '*.cpp' '*.h'`).
# Usage: check_format.sh <phaseplan-cli> <source-dir> <build-dir> (the CLI is not used).
set -eu
src="$2"
cd "$src"
if git rev-parse --is-inside-work-tree >/dev/null 2>&1; then
    files=$(git ls-files '*.cpp' '*.h')
else
    files=$(find chem app tests -name '*.cpp' -o -name '*.h')
fi
# shellcheck disable=SC2086 # the file names have no spaces (checked by the line below)
echo "$files" | grep -q ' ' && { echo "a source file name has a space"; exit 1; }
log=$(mktemp)
trap 'rm -f "$log"' EXIT
if clang-format --dry-run --Werror $files 2>"$log"; then
    echo "$(echo "$files" | wc -l) files follow .clang-format"
else
    grep -m 20 'error:' "$log" || true
    echo "$(grep -c 'error:' "$log") lines differ from .clang-format (clang-format -i FILE)"
    exit 1
fi
