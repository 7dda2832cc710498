#!/usr/bin/env bash
# One entry point for a fresh checkout: sets up .venv on first use, then
#   bash dev.sh demo    open curator on the bundled demo collection
#   bash dev.sh test    lint and run the whole test suite
#   bash dev.sh bench   run the benchmarks
#   bash dev.sh run ... run the curator command with any arguments
set -euo pipefail
cd "$(dirname "$0")"
VENV=.venv
PY="$VENV/bin/python"

setup() {
  if [ ! -x "$PY" ]; then
    python3 -m venv "$VENV"
  fi
  local stamp="$VENV/.curator-installed"
  if [ ! -f "$stamp" ] || [ pyproject.toml -nt "$stamp" ]; then
    "$PY" -m pip install --quiet --upgrade pip >/dev/null
    "$PY" -m pip install --quiet -e ".[test]"
    touch "$stamp"
  fi
  # Qt's offscreen platform needs a few system libraries that slim machines may lack.
  if ! QT_QPA_PLATFORM=offscreen "$PY" -c "import PySide6.QtWidgets" >/dev/null 2>&1; then
    if command -v apt-get >/dev/null 2>&1 && [ "$(id -u)" = 0 ]; then
      apt-get update -qq >/dev/null && apt-get install -y -qq libegl1 libgl1 libxkbcommon0 \
        libfontconfig1 libdbus-1-3 libxcb-cursor0 >/dev/null
    fi
  fi
}

case "${1:-demo}" in
  demo)
    setup
    shift || true
    if [ -z "${DISPLAY:-}" ] && [ -z "${WAYLAND_DISPLAY:-}" ] && [ -z "${QT_QPA_PLATFORM:-}" ]; then
      echo "No screen here; showing suggestions for a demo title in the terminal instead." >&2
      exec "$VENV/bin/curator" suggest --seed "The Letter Writer of Hollinmere" "$@"
    fi
    exec "$VENV/bin/curator" "$@"
    ;;
  test)
    setup
    "$VENV/bin/ruff" check curator tests benchmarks demo_collection
    set +e
    QT_QPA_PLATFORM=offscreen "$VENV/bin/pytest" "${@:2}"
    status=$?
    set -e
    # pytest exits 5 when it collected no test; that is a failure of the suite, say so plainly.
    if [ "$status" = 5 ]; then echo "pytest collected no tests" >&2; exit 1; fi
    exit "$status"
    ;;
  bench)
    setup
    exec "$PY" benchmarks/run_all.py "${@:2}"
    ;;
  run)
    setup
    exec "$VENV/bin/curator" "${@:2}"
    ;;
  *)
    echo "usage: bash dev.sh [demo|test|bench|run ARGS...]" >&2
    exit 2
    ;;
esac
