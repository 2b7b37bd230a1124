#!/bin/sh
# Installs the Debian packages listed in .ci/packages.txt (run as root on Debian 12).
# Skips the network entirely when every package is already installed.
set -eu
here=$(dirname "$0")
pkgs=$(grep -v '^#' "$here/packages.txt" | grep -v '^$' | tr '\n' ' ')
missing=""
for p in $pkgs; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing="$missing $p"
done
if [ -n "$missing" ]; then
  echo "install-deps: installing$missing"
  apt-get update -qq
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends $missing
fi
