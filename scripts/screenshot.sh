#!/usr/bin/env bash
# Screenshots of the window on a virtual X server: installs Xvfb and the xcb libraries Qt needs
# when they are missing, runs scripts/screenshot.py on display :99, then stops the server.
set -euo pipefail
cd "$(dirname "$0")/.."
PY="${PYTHON:-.venv/bin/python}"
PACKAGES=(xvfb libxcb-icccm4 libxcb-keysyms1 libxcb-cursor0)

missing=()
for package in "${PACKAGES[@]}"; do
  dpkg -s "$package" >/dev/null 2>&1 || missing+=("$package")
done
if [ "${#missing[@]}" -gt 0 ]; then
  if [ "$(id -u)" != 0 ]; then
    echo "screenshot: please install ${missing[*]} (apt-get install ${missing[*]})" >&2
    exit 1
  fi
  apt-get update -qq
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "${missing[@]}" >/dev/null
fi

DISPLAY_NUMBER="${SCREENSHOT_DISPLAY:-:99}"
Xvfb "$DISPLAY_NUMBER" -screen 0 1600x1000x24 -nolisten tcp >/dev/null 2>&1 &
XVFB_PID=$!
trap 'kill "$XVFB_PID" 2>/dev/null || true; wait "$XVFB_PID" 2>/dev/null || true' EXIT
for _ in $(seq 50); do
  [ -e "/tmp/.X11-unix/X${DISPLAY_NUMBER#:}" ] && break
  sleep 0.1
done

DISPLAY="$DISPLAY_NUMBER" QT_QPA_PLATFORM=xcb "$PY" scripts/screenshot.py "$@"
