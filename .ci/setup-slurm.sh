#!/usr/bin/env bash
# Installs the Slurm scheduler and the munge authentication daemon from Debian's packages, for the
# batch integration test (scripts/slurm-integration.sh). Idempotent and quiet; run as root by .ci/run.
set -euo pipefail
if command -v slurmctld >/dev/null 2>&1 && command -v slurmd >/dev/null 2>&1 \
  && command -v sbatch >/dev/null 2>&1 && command -v munged >/dev/null 2>&1; then
  echo "slurm-wlm and munge already installed"
  exit 0
fi
export DEBIAN_FRONTEND=noninteractive
# Wait for the package database if another installer holds it, rather than failing at once.
apt-get -o DPkg::Lock::Timeout=600 update -qq
apt-get -o DPkg::Lock::Timeout=600 install -y -qq --no-install-recommends slurm-wlm munge >/dev/null
echo "installed: $(slurmctld -V 2>/dev/null || echo slurmctld?) and munge"
