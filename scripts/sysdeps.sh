#!/bin/sh
# Install the few Debian libraries Qt and the PDF checks need, only when apt is
# there, we are root, and something is missing. Silent when all are present.
command -v dpkg-query >/dev/null 2>&1 || exit 0
missing=""
for p in "$@"; do
    dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing="$missing $p"
done
[ -z "$missing" ] && exit 0
if [ "$(id -u)" != "0" ] || ! command -v apt-get >/dev/null 2>&1; then
    echo "droprig: missing Debian packages:$missing (install them with apt-get as root)" >&2
    exit 0
fi
echo "droprig: installing Debian packages:$missing"
export DEBIAN_FRONTEND=noninteractive
apt-get update -qq >/dev/null && apt-get install -y -qq --no-install-recommends $missing >/dev/null
