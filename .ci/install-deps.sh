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
# The locale test (tests/check_cli_locale.sh) runs the command-line tool under a decimal-comma
# locale: generate de_DE.UTF-8 once if it is missing (idempotent).
if ! locale -a 2>/dev/null | grep -qix 'de_DE\.utf-\?8'; then
  echo "install-deps: generating the de_DE.UTF-8 locale"
  if grep -q '^# *de_DE\.UTF-8 UTF-8' /etc/locale.gen; then
    sed -i 's/^# *\(de_DE\.UTF-8 UTF-8\)/\1/' /etc/locale.gen
  elif ! grep -q '^de_DE\.UTF-8 UTF-8' /etc/locale.gen; then
    echo 'de_DE.UTF-8 UTF-8' >> /etc/locale.gen
  fi
  locale-gen
fi
