#!/usr/bin/env bash
# Regenerates every reference fixture under test/reference/fixtures.
# Each generator is test/reference/gen_*.py (run with Debian's /usr/bin/python3)
# or test/reference/gen_*.R (run with Debian's Rscript); each writes its own
# JSON files recording source, version and parameters.
# Needs: apt-get install r-base-core r-cran-mass python3-scipy python3-statsmodels python3-pywt python3-mpmath python3-cvxopt
set -euo pipefail
cd "$(dirname "$0")"
for f in gen_*.py; do [ -e "$f" ] || continue; echo "== $f"; /usr/bin/python3 "$f"; done
for f in gen_*.R; do [ -e "$f" ] || continue; echo "== $f"; Rscript --vanilla "$f"; done
