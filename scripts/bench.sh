#!/usr/bin/env bash
# npm run bench: every benchmark of the product; each prints its figures, none asserts.
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."
for b in scripts/bench-*.ts; do
  echo "== $b"
  npx tsx "$b"
done
