#!/usr/bin/env bash
# Benchmarks: BenchmarkDotNet kernels (bench/Serimetry.Bench) and whole-pipeline comparisons against
# reference tools in the same script (scripts/bench-*.sh: registration vs elastix; the service's scale-out and
# status-polling load). Usage: scripts/bench.sh [BenchmarkDotNet filter, default '*']
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"
dotnet run -c Release --project bench/Serimetry.Bench -- --filter "${1:-*}"
for s in scripts/bench-*.sh; do
  [ -x "$s" ] && "$s"
done
