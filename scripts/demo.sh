#!/usr/bin/env bash
# Runs the invented demo patient end to end: scripts/demo.sh [OUT_DIR]
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
exec "$root/scripts/serimetry" demo --out "${1:-$root/out/demo}"
