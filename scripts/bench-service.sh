#!/usr/bin/env bash
# Service benchmarks on loopback: two 'serve' nodes on one PostgreSQL database against one node (batch wall time),
# and status polling under load while comparisons run (requests/s, p99). Each starts its own throwaway
# PostgreSQL cluster or data folder. Usage: scripts/bench-service.sh
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"
dotnet build -c Release bench/Serimetry.Bench --nologo -v q -clp:ErrorsOnly
bench="bench/Serimetry.Bench/bin/Release/net10.0/Serimetry.Bench.dll"
dotnet "$bench" scale-out --batch 6 --workers 1
dotnet "$bench" status-load --clients 16 --seconds 10 --running 2
