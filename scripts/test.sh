#!/usr/bin/env bash
# The test command: installs what the tests need (Debian packages, NuGet restore), runs every test
# project and ends with the line "N passed, N failed".
set -uo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"

# Outside reference tools (Debian packages), installed when missing.
need=()
command -v dcmdump >/dev/null 2>&1 || need+=(dcmtk)
command -v gdcmconv >/dev/null 2>&1 || need+=(libgdcm-tools)
command -v dciodvfy >/dev/null 2>&1 || need+=(dicom3tools)
command -v nifti_tool >/dev/null 2>&1 || need+=(nifti-bin)
command -v elastix >/dev/null 2>&1 || need+=(elastix)
command -v pvrg-jpeg >/dev/null 2>&1 || need+=(pvrg-jpeg)
[ -x /usr/bin/chromium ] || need+=(chromium)
ls /usr/lib/postgresql/*/bin/initdb >/dev/null 2>&1 || need+=(postgresql)
command -v Orthanc >/dev/null 2>&1 || [ -x /usr/sbin/Orthanc ] || need+=(orthanc)
[ -e /usr/share/orthanc/plugins/libOrthancDicomWeb.so ] || need+=(orthanc-dicomweb)
if [ ${#need[@]} -gt 0 ]; then
  sudo_cmd=""; [ "$(id -u)" -ne 0 ] && sudo_cmd="sudo"
  echo "installing Debian packages: ${need[*]}"
  $sudo_cmd apt-get update -qq && DEBIAN_FRONTEND=noninteractive $sudo_cmd apt-get install -y -qq "${need[@]}" >/dev/null \
    || { echo "could not install ${need[*]}"; echo "0 passed, 1 failed"; exit 1; }
fi

dotnet restore Serimetry.sln --nologo -v q || { echo "0 passed, 1 failed"; exit 1; }
dotnet build Serimetry.sln -c Release --no-restore --nologo -v q -clp:ErrorsOnly || { echo "0 passed, 1 failed"; exit 1; }

results="$root/artifacts/test-results"
rm -rf "$results"; mkdir -p "$results"
status=0
for proj in tests/*/*.csproj; do
  name="$(basename "$proj" .csproj)"
  dotnet test "$proj" -c Release --no-build --nologo -v q \
    --logger "trx;LogFileName=$name.trx" --results-directory "$results" "$@" || status=1
done

passed=0; failed=0
for trx in "$results"/*.trx; do
  [ -f "$trx" ] || continue
  counters="$(grep -o '<Counters [^>]*>' "$trx" | head -1)"
  p="$(echo "$counters" | sed -n 's/.* passed="\([0-9]*\)".*/\1/p')"
  f="$(echo "$counters" | sed -n 's/.* failed="\([0-9]*\)".*/\1/p')"
  passed=$((passed + ${p:-0})); failed=$((failed + ${f:-0}))
done
[ "$status" -ne 0 ] && [ "$failed" -eq 0 ] && failed=1
echo "$passed passed, $failed failed"
[ "$failed" -eq 0 ]
