#!/bin/sh
# beamsift against its vectorised numpy/pandas peer on the same catalogue
# and the same checks (benches/peer/job.toml, benches/peer/peer.py).
# Usage: benches/peer/run.sh [PYTHON]   (PYTHON with numpy and pandas;
# measured with numpy 2.4.6, pandas 3.1.1, Python 3.11.7). Prints, for
# 22 145 and 1 060 704 generated welded-I rows, both answers (rows passing,
# lightest) and the best of three wall times of each.
set -eu
PY=${1:-python3}
cd "$(dirname "$0")/../.."
cargo build --release --quiet
B=target/release/beamsift
DIR=${TMPDIR:-/tmp}/beamsift-peer
mkdir -p "$DIR"
TF="--tf 6,8,10,12,15,18,20,22,25,28,30,35,40mm --tw 5,6,8,10,12,14mm --lambda-f 9.15 --lambda-w 90.5 --price-per-kg 1.25"
[ -f "$DIR/22k.csv" ] || $B catalog generate welded-i --bf 100..600:20mm --hw 200..1400:25mm $TF -o "$DIR/22k.csv"
[ -f "$DIR/1m.csv" ] || $B catalog generate welded-i --bf 100..600:2mm --hw 200..1400:5mm $TF -o "$DIR/1m.csv"
best() { # best wall time in seconds of three runs of "$@"
    for i in 1 2 3; do
        s=$(date +%s.%N); "$@" > /dev/null 2>&1 || true; e=$(date +%s.%N)
        echo "$e - $s" | bc
    done | sort -n | head -1
}
for f in 22k 1m; do
    echo "== $f"
    $B select --job benches/peer/job.toml -c "$DIR/$f.csv" --top 1 -q --json |
        "$PY" -c 'import json,sys; d=json.load(sys.stdin); p=d["passing"]; print("beamsift: rows", d["counts"]["rows"], "passing", d["counts"]["passing"], "lightest", p[0]["name"] if p else None, "utilisation %.3f" % p[0]["utilisation"] if p else "")'
    "$PY" benches/peer/peer.py "$DIR/$f.csv" | tr '\n' ' '; echo
    tb=$(best $B select --job benches/peer/job.toml -c "$DIR/$f.csv" -q)
    tp=$(best "$PY" benches/peer/peer.py "$DIR/$f.csv")
    echo "wall: beamsift $tb s, peer $tp s, peer/beamsift $(echo "scale=2; $tp / $tb" | bc)"
done
