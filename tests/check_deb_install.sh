#!/bin/sh
# The Debian package installs and runs from a temporary root (issue 9): cpack builds the .deb
# from this build, dpkg -x unpacks it, and the unpacked programs run on the shipped demo without
# the source tree's data: phaseplan-cli on the demo recipe and `device formats` (run by
# phaseplan-cli-full), and phaseplan --self-test. Also: the
# package's dependencies came from the shared libraries (dpkg-shlibdeps names libqt6core6), the
# layout is Debian's (usr/bin, usr/share/{phaseplan,applications,icons,man}), and Qt's start-up
# messages stay off stderr with XDG_RUNTIME_DIR unset.
# Usage: check_deb_install.sh <phaseplan-cli> <source-dir> <build-dir>
set -eu
BUILD=$(cd "$3" && pwd)
[ -x "$BUILD/phaseplan" ] || { echo "SKIP: the app is not built here"; exit 0; }
work=$(mktemp -d "$BUILD/deb-check-XXXXXX")
trap 'rm -rf "$work"' EXIT
fail() { echo "FAIL: $*"; exit 1; }

(cd "$BUILD" && cpack -G DEB -B "$work/pkg" >"$work/cpack.log" 2>&1) || { cat "$work/cpack.log"; fail "cpack"; }
deb=$(ls "$work"/pkg/*.deb | head -1)
[ -f "$deb" ] || fail "no .deb made"
depends=$(dpkg-deb -f "$deb" Depends)
echo "Depends: $depends"
echo "$depends" | grep -q "libqt6core6" || fail "Depends lacks libqt6core6: not from dpkg-shlibdeps"
echo "$depends" | grep -q "libqrencode" || fail "Depends lacks libqrencode"

root="$work/root"
dpkg -x "$deb" "$root"
for f in usr/bin/phaseplan usr/bin/phaseplan-cli usr/libexec/phaseplan/phaseplan-cli-full \
         usr/share/phaseplan/data/reagents.json \
         usr/share/phaseplan/data/demo/overnight-sequence.json usr/share/applications/phaseplan.desktop \
         usr/share/icons/hicolor/scalable/apps/phaseplan.svg usr/share/man/man1/phaseplan.1 \
         usr/share/man/man1/phaseplan-cli.1; do
  [ -e "$root/$f" ] || fail "missing $f"
done

# Run from a folder outside the source and build trees.
cd "$work"
out=$("$root/usr/bin/phaseplan-cli" recipe "$root/usr/share/phaseplan/data/demo/buffer-phosphate-ph2.5.json")
echo "$out" | grep -q '"items"' || fail "phaseplan-cli recipe gave no items"
# The device, database and PDF commands run in usr/libexec/phaseplan/phaseplan-cli-full, which
# finds the same installed data.
out=$("$root/usr/bin/phaseplan-cli" device formats)
echo "$out" | grep -q '"formats"' || fail "phaseplan-cli device formats (through phaseplan-cli-full)"
# It reads the installed data, not the source tree's: without it, it fails and names the path.
mv "$root/usr/share/phaseplan/data" "$root/usr/share/phaseplan/data.away"
if "$root/usr/bin/phaseplan-cli" reagents >/dev/null 2>"$work/err"; then fail "ran without its data"; fi
grep -q "share/phaseplan/data" "$work/err" || fail "the missing-data error does not name the folder: $(cat "$work/err")"
# So does phaseplan-cli-full, from usr/libexec/phaseplan: the same folder, not one beside it.
if "$root/usr/bin/phaseplan-cli" sheet x.json -o "$work/x.pdf" >/dev/null 2>"$work/err"; then
  fail "sheet ran without its data"; fi
grep -q "$root/usr/share/phaseplan/data" "$work/err" ||
  fail "phaseplan-cli-full's missing-data error does not name the folder: $(cat "$work/err")"
mv "$root/usr/share/phaseplan/data.away" "$root/usr/share/phaseplan/data"

env -u XDG_RUNTIME_DIR HOME="$work/home" QT_QPA_PLATFORM=offscreen QT_QUICK_BACKEND=software \
  "$root/usr/bin/phaseplan" --self-test >"$work/self.out" 2>"$work/self.err" || {
  cat "$work/self.out" "$work/self.err"; fail "phaseplan --self-test from the unpacked root"; }
[ ! -s "$work/self.err" ] || { cat "$work/self.err"; fail "the app wrote to stderr at start"; }
echo "ok: $(basename "$deb") unpacked and ran (cli demo recipe, app self-test)"
