"""Compares the project's IAPWS-IF97 (printed by if97_dump) with Debian's python3-iapws, an independent
implementation of the same release (IAPWS R7-97(2012)): saturation pressure and temperature, regions 1
and 2 (v, h, s, cp) agree to 1e-9 relative. Usage: check_if97_iapws.py <if97_dump> <dist-packages dir>.
Exit 77 (skipped) when the package is not available."""
import subprocess
import sys

dump, site = sys.argv[1], sys.argv[2]
sys.path.insert(0, site)
try:
    from iapws import iapws97
except ImportError:
    print(f"python3-iapws not found under {site}: run scripts/fetch-iapws; skipped")
    sys.exit(77)

worst, count, failures = 0.0, 0, []


def check(what, ours, theirs, tol=1e-9):
    global worst, count
    count += 1
    rel = abs(ours / theirs - 1.0)
    worst = max(worst, rel)
    if rel > tol:
        failures.append(f"{what}: ours {ours!r}, iapws {theirs!r}, relative {rel:.3g}")


for line in subprocess.run([dump], check=True, capture_output=True, text=True).stdout.splitlines():
    kind, *x = line.split()
    x = [float(v) for v in x]
    if kind == "sat":
        check(f"p_sat({x[0]} K)", x[1], iapws97._PSat_T(x[0]) * 1e6)
    elif kind == "tsat":
        check(f"T_sat({x[0]} Pa)", x[1], iapws97._TSat_P(x[0] / 1e6))
    else:
        t, p, v, h, s, cp = x
        ref = (iapws97._Region1 if kind == "r1" else iapws97._Region2)(t, p / 1e6)
        where = f"{kind}({t} K, {p} Pa)"
        check(f"{where} v", v, ref["v"])
        check(f"{where} h", h, ref["h"] * 1e3)
        check(f"{where} s", s, ref["s"] * 1e3)
        check(f"{where} cp", cp, ref["cp"] * 1e3)

print(f"{count} values compared with python3-iapws, largest relative difference {worst:.3g}")
for f in failures:
    print("MISMATCH", f)
sys.exit(1 if failures else 0)
