#!/usr/bin/env bash
# `elyblock fit` through its binary, one case per CTest test: check_fit.sh <elyblock binary> <source dir> <case>
set -uo pipefail
bin=$1; src=$2; case=$3
tmp=$(mktemp -d); trap 'rm -rf "$tmp"' EXIT
fail() { echo "FAIL: $*"; exit 1; }
py=/usr/bin/python3

# A PEM plant at 80 degC whose anode gas stays below the alarm levels, and a curve made from it
# with 0.7 mV of alternating scatter, in the units of a test bench (A/cm2, degC, mV).
cat >"$tmp/plant.json" <<'JSON'
{ "technology": "pem", "stack": { "cells": 100, "active_area": 0.1 },
  // comments are allowed in plant descriptions
  "cell": { "h2_recombination_fraction_anode": 0.9 },
  "operating": { "spec": "current_density", "temperature": "80 degC" } }
JSON
make_curve() {
  "$bin" sweep "$tmp/plant.json" --over in.current_density --from 6000 --to 20000 --points 12 --columns cell.voltage \
    --output "$tmp/sweep.csv" || fail "sweep exited $?"
  $py - "$tmp/sweep.csv" "$tmp/data.csv" <<'PY'
import csv, sys
rows = list(csv.DictReader(open(sys.argv[1])))
with open(sys.argv[2], "w") as f:
    f.write("# made by the model itself, with scatter (test data)\n")
    f.write("in.current_density [A/cm2], in.temperature [degC], cell.voltage [mV]\n")
    for i, r in enumerate(rows):
        f.write("%g, 80, %.4f\n" % (float(r["in.current_density [A/m2]"]) / 1e4, float(r["cell.voltage [V]"]) * 1e3 + (0.7 if i % 2 else -0.7)))
PY
}

case $case in
  recovers)
    make_curve
    # Start 30 % off; the fit brings both parameters back to the plant's values.
    "$bin" fit "$tmp/plant.json" "$tmp/data.csv" --free anode_exchange_current_density,param.cell.contact_resistance \
      --set param.cell.anode_exchange_current_density=1.3e-3 --set param.cell.contact_resistance=1.3e-5 \
      --output "$tmp/fitted.json" >"$tmp/out" 2>"$tmp/err" || fail "fit exited $?: $(cat "$tmp/err")"
    grep -q "^param.cell.anode_exchange_current_density" "$tmp/out" || fail "no parameter row: $(cat "$tmp/out")"
    grep -q "^RMSE of cell.voltage over 12 rows" "$tmp/out" || fail "no RMSE line: $(cat "$tmp/out")"
    $py - "$tmp/fitted.json" <<'PY' || fail "calibrated plant is not the expected JSON"
import json, sys
p = json.load(open(sys.argv[1]))
c = p["cell"]
j0 = float(c["anode_exchange_current_density"].split()[0]); r = float(c["contact_resistance"].split()[0])
assert abs(j0 / 1e-3 - 1) < 0.05, j0     # the plant's values (registry defaults), within the scatter
assert abs(r / 1e-5 - 1) < 0.02, r
assert p["operating"]["temperature"] == "80 degC"   # untouched members keep their text
PY
    # The calibrated plant solves to the fitted model's values.
    v=$("$bin" solve "$tmp/fitted.json" --set in.current_density=10000 --format csv | grep '^cell.voltage,' | cut -d, -f2)
    $py -c "import sys; v=float('$v'); sys.exit(0 if abs(v - 1.6956) < 2e-3 else 1)" || fail "calibrated plant gives $v V at 1 A/cm2" ;;
  report_json)
    make_curve
    "$bin" fit "$tmp/plant.json" "$tmp/data.csv" --free contact_resistance --format json >"$tmp/r.json" \
      || fail "fit exited $?"
    $py - "$tmp/r.json" <<'PY' || fail "report is not the expected JSON"
import json, sys
r = json.load(open(sys.argv[1]))
(p,) = r["parameters"]
assert p["name"] == "param.cell.contact_resistance" and p["unit"] == "ohm m2" and p["scale"] == "log"
assert p["interval_95"][0] < p["value"] < p["interval_95"][1]
assert 0.0003 < r["rmse_V"] < 0.001, r["rmse_V"]          # the 0.7 mV scatter
assert len(r["residuals"]) == 12 and r["measured"] == ["cell.voltage"]
assert r["plant"]["cell"]["contact_resistance"].endswith(" ohm m2")
PY
    # A weight column (row 3 weighed out) and a row without a measured voltage (row 5).
    $py - "$tmp/data.csv" "$tmp/weighted.csv" <<'PY'
import sys
lines = [l.rstrip("\n") for l in open(sys.argv[1]) if not l.startswith("#")]
out = [lines[0] + ", weight:cell.voltage"]
for i, l in enumerate(lines[1:]):
    cells = [c.strip() for c in l.split(",")]
    if i == 4: cells[2] = ""
    out.append(", ".join(cells) + (", 0" if i == 2 else ", "))
open(sys.argv[2], "w").write("\n".join(out) + "\n")
PY
    "$bin" fit "$tmp/plant.json" "$tmp/weighted.csv" --free contact_resistance --format json >"$tmp/w.json" \
      || fail "weighted fit exited $?"
    $py - "$tmp/w.json" <<'PY' || fail "weights or missing values not applied"
import json, sys
r = json.load(open(sys.argv[1]))
assert r["points"] == 12 and r["measurements"] == 10, (r["points"], r["measurements"])
assert r["residuals"][4] == [None] and r["fitted"][4][0] > 1.5
PY
    ;;
  published)
    # One published operating point (tests/data: DOE 2022 status of liquid alkaline stacks,
    # 0.5 A/cm2 at 1.9 V/cell): the electrode resistance of the minimal alkaline plant is fitted
    # to it. One value for one parameter leaves no residual variance: the fit says so.
    "$bin" fit "$src/examples/minimal/alkaline.json" "$src/tests/data/doe_2022_liquid_alkaline_status.csv" \
      --free electrode_resistance --output "$tmp/fitted.json" >"$tmp/out" 2>"$tmp/err" || fail "fit exited $?: $(cat "$tmp/err")"
    grep -q "as many measured values as free parameters" "$tmp/err" || fail "no warning: $(cat "$tmp/err")"
    "$bin" solve "$tmp/fitted.json" --set in.current_density=5000 --format csv >"$tmp/s.csv" || fail "solve exited $?"
    $py - "$tmp/s.csv" <<'PY' || fail "calibrated plant misses the published point"
import csv, sys
v = {r[0]: float(r[1]) for r in csv.reader(open(sys.argv[1])) if r[0] != "name" and r[1] not in ("", "nan")}
assert abs(v["cell.voltage"] - 1.9) < 1e-9, v["cell.voltage"]
# The same table gives the stack's electrical efficiency, 51 kWh/kg H2 (two significant figures):
# an outside check of the specific energy the calibrated model computes at that point.
assert abs(v["perf.specific_energy"] / 3.6e6 - 51) < 0.5 + 1e-9, v["perf.specific_energy"] / 3.6e6
PY
    ;;
  errors)
    make_curve
    # expect_exit <status> <text in the message> <arguments...>
    expect_exit() {
      local want=$1 text=$2; shift 2
      "$bin" "$@" 2>"$tmp/e"; local rc=$?
      [[ $rc -eq $want ]] || fail "fit ${*:2} gave exit $rc, not $want"
      grep -qF -- "$text" "$tmp/e" || fail "fit ${*:2}: message lacks '$text': $(cat "$tmp/e")"
    }
    expect_exit 2 "--free" fit "$tmp/plant.json" "$tmp/data.csv"
    expect_exit 2 "a plant description and a data file" fit "$tmp/plant.json" --free contact_resistance
    expect_exit 1 "no_such_key" fit "$tmp/plant.json" "$tmp/data.csv" --free no_such_key
    printf 'in.current_density,cell.colour\n1000,3\n' >"$tmp/bad1.csv"
    expect_exit 1 "bad1.csv:1: column 'cell.colour'" fit "$tmp/plant.json" "$tmp/bad1.csv" --free contact_resistance
    printf 'in.current_density [furlong],cell.voltage\n1000,1.6\n2000,1.7\n' >"$tmp/bad2.csv"
    expect_exit 1 "furlong" fit "$tmp/plant.json" "$tmp/bad2.csv" --free contact_resistance
    printf 'in.current_density [A/cm2],cell.voltage\n1,1.6\n2\n' >"$tmp/bad3.csv"
    expect_exit 1 "bad3.csv:3: 1 values for 2 columns" fit "$tmp/plant.json" "$tmp/bad3.csv" --free contact_resistance
    printf 'in.current_density [A/cm2],in.temperature [bar]\n1,1\n' >"$tmp/bad4.csv"
    expect_exit 1 "no measured output" fit "$tmp/plant.json" "$tmp/bad4.csv" --free contact_resistance
    printf 'in.current_density [A/cm2],in.temperature [bar],cell.voltage\n1,1,1.7\n' >"$tmp/bad5.csv"
    expect_exit 1 "expected a quantity in K, got 'bar'" fit "$tmp/plant.json" "$tmp/bad5.csv" --free contact_resistance
    expect_exit 1 "lower bound 0.002 ohm m2 of param.cell.contact_resistance is outside its limits" \
      fit "$tmp/plant.json" "$tmp/data.csv" --free contact_resistance --bound contact_resistance=2e-3:
    expect_exit 2 "not among the --free parameters" \
      fit "$tmp/plant.json" "$tmp/data.csv" --free contact_resistance --bound membrane_water_content=2:3 ;;
  *) fail "unknown case $case" ;;
esac
echo "ok: $case"
