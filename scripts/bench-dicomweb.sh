#!/usr/bin/env bash
# DICOMweb fetch speed: serimetry's client (QIDO-RS + WADO-RS per series, every instance checked) against curl
# (one raw WADO-RS request) on the same Orthanc server (Debian orthanc + orthanc-dicomweb) started on loopback.
# Pass the number of runs (default 5).
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"
if ! command -v Orthanc >/dev/null 2>&1 && [ ! -x /usr/sbin/Orthanc ]; then
  echo "Orthanc not found: skipping the DICOMweb benchmark (apt-get install orthanc orthanc-dicomweb)"; exit 0
fi
dotnet run -c Release --project bench/Serimetry.Bench -- dicomweb-vs-curl "$@"
