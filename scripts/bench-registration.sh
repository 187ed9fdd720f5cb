#!/usr/bin/env bash
# Rigid registration vs elastix (reference, Debian package) on analytic phantoms with known truth and
# matched settings. Default: one 384x384x24 pair (speed); pass e.g. "--size 160 --cases 20" for the
# accuracy sweep; "--deformable" times rigid + B-spline (deformable preset) against elastix Euler + BSpline.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"
command -v elastix >/dev/null 2>&1 || echo "elastix not found: only Serimetry is timed (apt-get install elastix)"
dotnet run -c Release --project bench/Serimetry.Bench -- registration-vs-elastix "$@"
