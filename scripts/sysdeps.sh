#!/bin/sh
# Install the few Debian packages droprig needs, only when apt is there, we are
# root, and something is missing; otherwise say plainly what to install. Silent
# when all are present.
#
# usage: sysdeps.sh PYTHON PACKAGE...
# PYTHON is the interpreter `make` builds the venv with: when it cannot make a
# venv (Debian ships ensurepip apart, in python3.X-venv), the python3.X-venv
# package matching its version is added to the list.
py="${1:-python3}"
[ $# -gt 0 ] && shift
need_venv=""
if ! "$py" -c "import ensurepip, venv" >/dev/null 2>&1; then
    ver=$("$py" -c 'import sys; print("%d.%d" % sys.version_info[:2])' 2>/dev/null)
    need_venv="python${ver:-3}-venv"
fi
if ! command -v dpkg-query >/dev/null 2>&1; then
    if [ -n "$need_venv" ]; then
        echo "droprig: '$py -m venv' cannot work: the module ensurepip is missing." >&2
        echo "droprig: install your system's venv/ensurepip package for Python ${ver:-3}" \
             "(Debian/Ubuntu: $need_venv), or use another Python 3.11+, e.g. make PYTHON=python3.12" >&2
        exit 1
    fi
    exit 0
fi
missing=""
for p in "$@"; do
    dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing="$missing $p"
done
[ -n "$need_venv" ] && missing="$missing $need_venv"
[ -z "$missing" ] && exit 0
if [ "$(id -u)" != "0" ] || ! command -v apt-get >/dev/null 2>&1; then
    echo "droprig: missing Debian packages:$missing" >&2
    echo "droprig: install them as root with: apt-get install$missing" >&2
    [ -n "$need_venv" ] && exit 1  # no venv, no droprig: stop here with the message
    exit 0
fi
echo "droprig: installing Debian packages:$missing"
export DEBIAN_FRONTEND=noninteractive
apt-get update -qq >/dev/null && apt-get install -y -qq --no-install-recommends $missing >/dev/null
