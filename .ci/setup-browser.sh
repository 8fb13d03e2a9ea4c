#!/usr/bin/env bash
# Installs what the report tests need: Debian's headless-capable Chromium (driven by playwright-core with
# executablePath=/usr/bin/chromium) and a font for the SVG-to-PNG renderer. Idempotent and quiet; run as root.
set -euo pipefail
if [ -x /usr/bin/chromium ] && fc-list 2>/dev/null | grep -qi "DejaVu Sans"; then
  exit 0
fi
export DEBIAN_FRONTEND=noninteractive
apt-get update -qq
apt-get install -y -qq chromium fonts-dejavu-core fontconfig >/dev/null
