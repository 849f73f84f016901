#!/usr/bin/env bash
# The browser and real-editor tests drive Debian's Chromium. Installs it when
# missing and this is a Debian machine we may administer; otherwise says how.
set -euo pipefail
if [ -x /usr/bin/chromium ]; then exit 0; fi
if [ "$(id -u)" = 0 ] && command -v apt-get >/dev/null 2>&1; then
  echo "ensure-chromium: installing Debian's chromium (once)"
  DEBIAN_FRONTEND=noninteractive apt-get update -qq
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null
  exit 0
fi
echo "ensure-chromium: /usr/bin/chromium is missing; install Debian's chromium package (sudo apt-get install chromium)" >&2
exit 1
