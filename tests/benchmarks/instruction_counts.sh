#!/usr/bin/env bash
# Instructions per operation under callgrind: each operation of instruction_counts (built with the
# benchmarks) runs at two loop lengths; the difference of the counts over the difference of the lengths
# leaves out the set-up. Steady where timings on a shared machine move by 10-20 %. By hand only:
#   tests/benchmarks/instruction_counts.sh [build-dir] [operation ...]
set -euo pipefail
build=${1:-build}
shift || true
exe="$build/tests/benchmarks/instruction_counts"
[ -x "$exe" ] || { echo "build $exe first (cmake --build $build --target instruction_counts)" >&2; exit 2; }
ops=("$@")
[ ${#ops[@]} -gt 0 ] || ops=(single single_temperature power_profile batch batch_temperature batch_peer batch_peer_power)
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
count() {  # instructions of one run: the total line of callgrind's summary
    valgrind --tool=callgrind --callgrind-out-file="$tmp/out" "$exe" "$1" "$2" >/dev/null 2>"$tmp/log"
    sed -n 's/.*Collected : \([0-9]*\).*/\1/p' "$tmp/log"
}
for op in "${ops[@]}"; do
    case $op in batch*) n1=2000; n2=12000 ;; power*) n1=200; n2=1200 ;; *) n1=500; n2=3000 ;; esac
    c1=$(count "$op" $n1)
    c2=$(count "$op" $n2)
    echo "$op: $(( (c2 - c1) / (n2 - n1) )) instructions per point"
done
