#!/usr/bin/env bash
# Command-line checks, one case per CTest test: check_cli.sh <elyblock binary> <source dir> <case>
set -uo pipefail
bin=$1; src=$2; case=$3
demo=$src/examples/demo-plant.json
tmp=$(mktemp -d); trap 'rm -rf "$tmp"' EXIT
fail() { echo "FAIL: $*"; exit 1; }

case $case in
  solve_table)
    out=$("$bin" solve "$demo") || fail "solve exited $?"
    for want in "cell voltage" "reversible voltage" "specific energy, DC stack" "make-up water" "heat duty" \
                "H2 in anode gas" "Alarms" "CAUTION" "licensed engineering practice"; do
      grep -qF "$want" <<<"$out" || fail "summary lacks '$want'"
    done ;;
  solve_json)
    "$bin" solve "$demo" --format json >"$tmp/r.json" || fail "json exited $?"
    /usr/bin/python3 - "$tmp/r.json" <<'PY' || fail "report is not the expected JSON"
import json, sys
r = json.load(open(sys.argv[1]))
v = {k: x["value"] for k, x in r["variables"].items()}
parts = v["cell.reversible_voltage"] + v["cell.activation_anode"] + v["cell.activation_cathode"] + v["cell.ohmic"] + v["cell.concentration"]
assert abs(parts - v["cell.voltage"]) < 1e-12, (parts, v["cell.voltage"])
assert abs(v["perf.specific_energy"] - v["stack.power"] / v["product.hydrogen"]) < 1e-6 * v["perf.specific_energy"]
assert r["technology"] == "pem"
PY
    ;;
  sweep_csv)
    "$bin" sweep "$demo" --over in.current_density --from 1000 --to 20000 --points 11 --output "$tmp/c.csv" \
      || fail "sweep exited $?"
    [[ $(wc -l <"$tmp/c.csv") -eq 12 ]] || fail "expected a header and 11 rows"
    head -1 "$tmp/c.csv" | grep -q '^in.current_density,status,cell.current_density,cell.voltage' || fail "bad header"
    # voltage rises along the polarization curve
    awk -F, 'NR>2 && $4 <= prev {exit 1} NR>1 {prev=$4}' "$tmp/c.csv" || fail "voltage does not rise with current density" ;;
  power_spec)
    out=$("$bin" solve "$demo" --spec power --set in.power=12e6 --format csv) || fail "power spec exited $?"
    grep -q '^stack.power,12000000,W' <<<"$out" || fail "stack.power is not the setpoint: $(grep stack.power <<<"$out")" ;;
  bad_input)
    "$bin" solve /nonexistent.json 2>"$tmp/e"; rc=$?
    [[ $rc -eq 1 ]] || fail "missing file gave exit $rc"; grep -q "nonexistent.json" "$tmp/e" || fail "message lacks the file"
    echo '{"technology":"pem","stack":{"cells":0,"active_area":0.1},"operating":{"spec":"current_density"}}' >"$tmp/bad.json"
    "$bin" solve "$tmp/bad.json" 2>"$tmp/e"; rc=$?
    [[ $rc -eq 1 ]] || fail "bad config gave exit $rc"; grep -q "cells" "$tmp/e" || fail "message lacks the key"
    "$bin" solve "$demo" --set in.temperature=nan 2>"$tmp/e"; rc=$?
    [[ $rc -eq 2 ]] || fail "NaN gave exit $rc"
    "$bin" solve "$demo" --set cell.colour=3 2>"$tmp/e"; rc=$?
    [[ $rc -eq 1 ]] || fail "unknown variable gave exit $rc"; grep -q "cell.colour" "$tmp/e" || fail "message lacks the name"
    "$bin" frobnicate 2>"$tmp/e"; rc=$?
    [[ $rc -eq 2 ]] || fail "unknown command gave exit $rc"
    "$bin" solve "$demo" --spec power --set in.power=1e12 2>"$tmp/e"; rc=$?
    [[ $rc -eq 1 ]] || fail "infeasible power gave exit $rc"; grep -q "maximum current density" "$tmp/e" || fail "no limit named" ;;
  alarm)
    # 6 % load at 30 bar: hydrogen crossing the membrane raises the anode-gas alarm; the run still
    # succeeds and says which alarm, on stderr and in the table.
    out=$("$bin" solve "$demo" --set in.current_density=1500 2>"$tmp/e") || fail "alarm run exited $?"
    grep -q "warning: solved with alarms: hydrogen in the anode gas" "$tmp/e" || fail "no alarm message: $(cat "$tmp/e")"
    grep -q "RAISED  alarm.h2_in_o2" <<<"$out" || fail "table lacks the raised alarm" ;;
  variables)
    out=$("$bin" variables "$demo") || fail "variables exited $?"
    grep -q '^cell.voltage ' <<<"$out" || fail "no cell.voltage"
    grep -q '^in.temperature .*input' <<<"$out" || fail "no input in.temperature" ;;
  *) fail "unknown case $case" ;;
esac
echo "ok: $case"
