#!/usr/bin/env bash
# DICOM receive speed: dcmtk's storescu sends one phantom DICOM study (several times) to the receiver of
# 'serimetry serve --dicom-port' and, in the same run, to dcmtk's own storescp as the reference; prints the
# wall-time ratio. Needs dcmtk (scripts/test.sh installs it). Usage: scripts/bench-dicom-receive.sh [REPEATS]
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
repeats="${1:-5}"
work="$(mktemp -d)"
pids=()
cleanup() { for p in "${pids[@]}"; do kill "$p" 2>/dev/null || true; done; rm -rf "$work"; }
trap cleanup EXIT

free_port() { python3 -c 'import socket; s=socket.socket(); s.bind(("127.0.0.1",0)); print(s.getsockname()[1]); s.close()'; }

"$root/scripts/serimetry" phantom --out "$work/phantom" --seed 5 --visits 1 --format dicom >/dev/null
study="$work/phantom/visit-0/dicom"
files=$(find "$study" -name '*.dcm' | wc -l)
bytes=$(du -sb "$study" | cut -f1)

ours=$(free_port); http=$(free_port); ref=$(free_port)
"$root/scripts/serimetry" serve --data "$work/data" --urls "http://127.0.0.1:$http" --dicom-port "$ours" --auto-compare false \
  >"$work/serve.log" 2>&1 & pids+=($!)
mkdir -p "$work/storescp"
storescp -aet REFERENCE -od "$work/storescp" "$ref" >/dev/null 2>&1 & pids+=($!)
for _ in $(seq 1 300); do
  echoscu -aec SERIMETRY 127.0.0.1 "$ours" >/dev/null 2>&1 && echoscu -aec REFERENCE 127.0.0.1 "$ref" >/dev/null 2>&1 && break
  sleep 0.2
done

send() { storescu -aec "$1" +sd +r 127.0.0.1 "$2" "$study" >/dev/null; }
send SERIMETRY "$ours"; send REFERENCE "$ref"  # warm-up
t_ours=0; t_ref=0
for _ in $(seq 1 "$repeats"); do
  s=$(date +%s.%N); send SERIMETRY "$ours"; e=$(date +%s.%N); t_ours=$(echo "$t_ours + $e - $s" | bc -l)
  s=$(date +%s.%N); send REFERENCE "$ref"; e=$(date +%s.%N); t_ref=$(echo "$t_ref + $e - $s" | bc -l)
done
printf 'dicom receive: %d instances (%d bytes) x %d: serimetry %.3f s, dcmtk storescp %.3f s per study, ratio %.2f\n' \
  "$files" "$bytes" "$repeats" "$(echo "$t_ours / $repeats" | bc -l)" "$(echo "$t_ref / $repeats" | bc -l)" "$(echo "$t_ours / $t_ref" | bc -l)"
