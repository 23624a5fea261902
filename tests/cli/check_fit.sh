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
  "cell": { "h2_recombination_fraction_anode": 0.9, "anode_exchange_current_density": 1e-3, "contact_resistance": 1e-5 },
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
assert abs(j0 / 1e-3 - 1) < 0.05, j0     # the plant's values (set in plant.json), within the scatter
assert abs(r / 1e-5 - 1) < 0.02, r
assert p["operating"]["temperature"] == "80 degC"   # untouched members keep their text
PY
    # The calibrated plant solves to the fitted model's values.
    v=$("$bin" solve "$tmp/fitted.json" --set in.current_density=10000 --format csv | grep '^cell.voltage,' | cut -d, -f2)
    v0=$("$bin" solve "$tmp/plant.json" --set in.current_density=10000 --format csv | grep '^cell.voltage,' | cut -d, -f2)
    $py -c "import sys; v=float('$v'); sys.exit(0 if abs(v - float('$v0')) < 2e-3 else 1)" \
      || fail "calibrated plant gives $v V at 1 A/cm2, the plant it was made from $v0 V" ;;
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
    # Bounds as quantities with units, read as --set reads its values.
    "$bin" fit "$tmp/plant.json" "$tmp/data.csv" --free contact_resistance --bound 'contact_resistance=0.05 ohm cm2:0.5 ohm cm2' \
      --format json >"$tmp/b.json" || fail "bounded fit exited $?"
    $py - "$tmp/b.json" <<'PY' || fail "bounds with units not applied"
import json, sys
(p,) = json.load(open(sys.argv[1]))["parameters"]
assert abs(p["bounds"][0] / 5e-6 - 1) < 1e-12 and abs(p["bounds"][1] / 5e-5 - 1) < 1e-12, p["bounds"]
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
    # The table's RMSE is the report's: over the 11 rows where the voltage was measured (the row
    # weighed out included), the same number.
    "$bin" fit "$tmp/plant.json" "$tmp/weighted.csv" --free contact_resistance >"$tmp/w.txt" || fail "table exited $?"
    $py - "$tmp/w.json" "$tmp/w.txt" <<'PY' || fail "the table's RMSE is not the report's: $(cat "$tmp/w.txt")"
import json, re, sys
r = json.load(open(sys.argv[1]))
(line,) = [l for l in open(sys.argv[2]) if l.startswith("RMSE")]
m = re.fullmatch(r"RMSE of cell\.voltage over (\d+) rows: (\S+) V\n", line)
assert m and int(m.group(1)) == 11, line
assert abs(float(m.group(2)) / r["rmse"]["cell.voltage"] - 1) < 5e-4, (line, r["rmse"])
PY
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
    # expect_exit <status> <text in the message> <arguments...>: the status, and the message on
    # standard error as one line (usage errors: "elyblock: fit: <problem> (see ...)").
    expect_exit() {
      local want=$1 text=$2; shift 2
      "$bin" "$@" >"$tmp/o" 2>"$tmp/e"; local rc=$?
      [[ $rc -eq $want ]] || fail "fit ${*:2} gave exit $rc, not $want: $(cat "$tmp/e")"
      grep -qF -- "$text" "$tmp/e" || fail "fit ${*:2}: message lacks '$text': $(cat "$tmp/e")"
      if [[ $want -eq 2 ]]; then
        [[ $(wc -l <"$tmp/e") -eq 1 ]] || fail "fit ${*:2}: a usage error is one line: $(cat "$tmp/e")"
        [[ ! -s "$tmp/o" ]] || fail "fit ${*:2}: a usage error writes nothing to standard output"
      fi
    }
    # The command line: the standard one-line usage errors of every command (exit 2).
    expect_exit 2 "elyblock: fit: --free is required (see 'elyblock fit --help')" fit "$tmp/plant.json" "$tmp/data.csv"
    expect_exit 2 "elyblock: fit: data is required (see 'elyblock fit --help')" \
      fit "$tmp/plant.json" --free contact_resistance
    expect_exit 2 "elyblock: fit: --free: unknown variable 'no_such_key'" \
      fit "$tmp/plant.json" "$tmp/data.csv" --free no_such_key
    grep -qF "(see 'elyblock variables $tmp/plant.json' for the plant's variables)" "$tmp/e" \
      || fail "an unknown name does not point at the variables command: $(cat "$tmp/e")"
    expect_exit 2 "elyblock: fit: --free: 'in.temperature' is an input; fit tunable parameters (param.…)" \
      fit "$tmp/plant.json" "$tmp/data.csv" --free in.temperature
    expect_exit 2 "elyblock: fit: --free: 'param.cells' is a fixed parameter" \
      fit "$tmp/plant.json" "$tmp/data.csv" --free param.cells
    expect_exit 2 "elyblock: fit: --free: 'param.cell.contact_resistance' is given twice" \
      fit "$tmp/plant.json" "$tmp/data.csv" --free contact_resistance,param.cell.contact_resistance
    expect_exit 2 "elyblock: fit: --bound membrane_water_content: not among the --free parameters" \
      fit "$tmp/plant.json" "$tmp/data.csv" --free contact_resistance --bound membrane_water_content=2:3
    expect_exit 2 "elyblock: fit: --bound: expected NAME=LOW:HIGH" \
      fit "$tmp/plant.json" "$tmp/data.csv" --free contact_resistance --bound contact_resistance=1e-5
    expect_exit 2 "elyblock: fit: --bound contact_resistance: expected a quantity in ohm m2, got 'bar'" \
      fit "$tmp/plant.json" "$tmp/data.csv" --free contact_resistance --bound "contact_resistance=1 bar:"
    expect_exit 2 "elyblock: fit: --set in.temperature: data column already varies it" \
      fit "$tmp/plant.json" "$tmp/data.csv" --free contact_resistance --set in.temperature=350
    expect_exit 2 "elyblock: fit: --max-iterations: Value 0 not in range 1 to 1000000" \
      fit "$tmp/plant.json" "$tmp/data.csv" --free contact_resistance --max-iterations 0
    expect_exit 2 "elyblock: fit: --format: xml not in {table,json}" \
      fit "$tmp/plant.json" "$tmp/data.csv" --free contact_resistance --format xml
    # The model, the data or the output refused (exit 1): each message names the file, line and column.
    expect_exit 1 "elyblock: fit: lower bound 0.002 ohm m2 of param.cell.contact_resistance is outside its limits" \
      fit "$tmp/plant.json" "$tmp/data.csv" --free contact_resistance --bound contact_resistance=2e-3:
    printf 'in.current_density,cell.colour\n1000,3\n' >"$tmp/bad1.csv"
    expect_exit 1 "bad1.csv:1: column 'cell.colour'" fit "$tmp/plant.json" "$tmp/bad1.csv" --free contact_resistance
    printf 'in.current_density [furlong],cell.voltage\n1000,1.6\n2000,1.7\n' >"$tmp/bad2.csv"
    expect_exit 1 "bad2.csv:1: column 'in.current_density': unit 'furlong' is not known" \
      fit "$tmp/plant.json" "$tmp/bad2.csv" --free contact_resistance
    printf 'in.current_density [A/cm2],cell.voltage\n1,1.6\n2\n' >"$tmp/bad3.csv"
    expect_exit 1 "bad3.csv:3: 1 values for 2 columns" fit "$tmp/plant.json" "$tmp/bad3.csv" --free contact_resistance
    printf 'in.current_density [A/cm2],in.temperature [bar]\n1,1\n' >"$tmp/bad4.csv"
    expect_exit 1 "bad4.csv:1: column 'in.temperature': expected a quantity in K, got 'bar'" \
      fit "$tmp/plant.json" "$tmp/bad4.csv" --free contact_resistance
    printf 'in.current_density [A/cm2],in.temperature [degC]\n1,80\n' >"$tmp/bad5.csv"
    expect_exit 1 "bad5.csv:1: no measured output among the columns" fit "$tmp/plant.json" "$tmp/bad5.csv" --free contact_resistance
    printf 'in.current_density [A/cm2],cell.voltage\n1,1.7 V\n' >"$tmp/bad6.csv"
    expect_exit 1 "bad6.csv:2: column 'cell.voltage': '1.7 V' is not a finite number" \
      fit "$tmp/plant.json" "$tmp/bad6.csv" --free contact_resistance
    printf 'in.current_density [A/cm2],param.cell.contact_resistance,cell.voltage\n1,1e-5,1.7\n' >"$tmp/bad7.csv"
    expect_exit 1 "bad7.csv:1: column 'param.cell.contact_resistance' is a parameter" \
      fit "$tmp/plant.json" "$tmp/bad7.csv" --free contact_resistance
    expect_exit 1 "elyblock: fit: cannot read the data file '$tmp/none.csv'" \
      fit "$tmp/plant.json" "$tmp/none.csv" --free contact_resistance
    expect_exit 1 "elyblock: fit: cannot write to --output '/dev/full'" \
      fit "$tmp/plant.json" "$tmp/data.csv" --free contact_resistance --output /dev/full
    "$bin" fit "$tmp/plant.json" "$tmp/data.csv" --free contact_resistance >/dev/full 2>"$tmp/e"
    [[ $? -eq 1 ]] && grep -qF "cannot write to standard output" "$tmp/e" || fail "a full standard output is not reported: $(cat "$tmp/e")"
    ;;
  spec)
    make_curve
    # The data's input column in.current_density on a power-spec plant selects the current-density
    # spec, with a note, as sweep --over does; --spec power conflicts with it (usage error).
    sed 's/"spec": "current_density"/"spec": "power", "power": "1.4 MW"/' "$tmp/plant.json" >"$tmp/power.json"
    "$bin" fit "$tmp/power.json" "$tmp/data.csv" --free contact_resistance --format json >"$tmp/r.json" 2>"$tmp/e" \
      || fail "fit on a power plant exited $?: $(cat "$tmp/e")"
    grep -qF "elyblock: fit: the plant's spec power does not read in.current_density; fitting with spec current_density (choose one with --spec)" "$tmp/e" \
      || fail "no note of the spec: $(cat "$tmp/e")"
    $py -c "import json,sys; r=json.load(open('$tmp/r.json')); sys.exit(0 if 0.0003 < r['rmse_V'] < 0.001 else 1)" \
      || fail "the fit at the data's current densities does not find the 0.7 mV scatter"
    "$bin" fit "$tmp/power.json" "$tmp/data.csv" --free contact_resistance --spec power >"$tmp/o" 2>"$tmp/e"
    [[ $? -eq 2 ]] || fail "--spec power with current-density data is not a usage error"
    grep -qF "elyblock: fit: data column in.current_density: --spec power does not read in.current_density; give --spec current_density, or leave --spec out (see 'elyblock fit --help')" "$tmp/e" \
      || fail "conflict message: $(cat "$tmp/e")"
    # Help per command, on standard output.
    "$bin" fit --help >"$tmp/h" || fail "fit --help exited $?"
    grep -q -- "--free NAME,..." "$tmp/h" && grep -q -- "--bound NAME=LOW:HIGH" "$tmp/h" || fail "help lacks the options: $(cat "$tmp/h")"
    "$bin" --help | grep -q "^  fit " || fail "elyblock --help does not list fit"
    ;;
  *) fail "unknown case $case" ;;
esac
echo "ok: $case"
