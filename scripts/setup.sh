#!/usr/bin/env bash
# Installs the Debian 12 packages trivet needs to build and test, when they
# are missing. Idempotent, no prompts; run as root (or with sudo available).
set -euo pipefail

packages=(
  build-essential cmake pkg-config
  libboost-dev nlohmann-json3-dev libgtest-dev libcli11-dev
  libgnuplot-iostream-dev gnuplot-nox
  libboost-iostreams-dev libboost-system-dev libboost-filesystem-dev
  libzip-dev libpugixml-dev
  libcpp-httplib-dev
)
missing=()
for p in "${packages[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if [ ${#missing[@]} -eq 0 ]; then
  echo "setup: all packages present"
  exit 0
fi
SUDO=""
if [ "$(id -u)" -ne 0 ]; then SUDO="sudo"; fi
echo "setup: installing ${missing[*]}"
export DEBIAN_FRONTEND=noninteractive
$SUDO apt-get update -qq
$SUDO apt-get install -y -qq --no-install-recommends "${missing[@]}"
