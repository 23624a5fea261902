#!/usr/bin/python3
"""Compares the outputs of the FMU importer's runs on the Linux and the Windows binary (wine_fmu.sh).

usage: compare_values.py LINUX_VALUES WINDOWS_VALUES

Each file holds lines "<label> <variable> <value>" with 17 significant digits: the 60 steps of the
stepped run ("step K ...") and the settled state of the 40-hour steady run ("steady ...").
- The steady run must agree to 1e-12 relative: at a settled state each output is a function of the
  constant inputs alone, and both binaries come from the same source and the same compiler version.
- The stepped run must agree to 1e-9 relative. It is not bit-identical: mingw-w64 links its own exp,
  log and pow into the DLL, and they differ from glibc's by one unit in the last place for a few
  arguments (measured on this machine over 200 000 arguments: exp 160, log 50, pow 283 differ, none
  by more than 1 ulp); the first difference of the run is 1 ulp in heat.to_coolant at the first
  step, and the temperature controller and the integrator carry it on (largest seen: 3.6e-11
  relative, in heat.to_coolant, a difference of two larger heat flows).
Fails when a value is missing on either side, is not finite, or differs by more.
"""
import math
import sys

STEADY_RTOL = 1e-12
STEP_RTOL = 1e-9


def read(path):
    values = {}
    with open(path, encoding="utf-8") as f:
        for line in f:
            parts = line.split()
            if len(parts) >= 3:
                values[" ".join(parts[:-1])] = float(parts[-1])
    return values


def main():
    linux, windows = read(sys.argv[1]), read(sys.argv[2])
    errors = []
    if not linux or sorted(linux) != sorted(windows):
        errors.append(f"the two runs report different values: only Linux {sorted(set(linux) - set(windows))[:5]}, "
                      f"only Windows {sorted(set(windows) - set(linux))[:5]}")
    worst = {"steady": (0.0, ""), "step": (0.0, "")}
    identical = 0
    for key in sorted(set(linux) & set(windows)):
        a, b = linux[key], windows[key]
        kind = key.split()[0]
        rtol = STEADY_RTOL if kind == "steady" else STEP_RTOL
        if not (math.isfinite(a) and math.isfinite(b)):
            errors.append(f"{key}: not finite (Linux {a!r}, Windows {b!r})")
            continue
        identical += a == b
        rel = abs(a - b) / max(abs(a), abs(b)) if a != b else 0.0
        if rel > worst[kind][0]:
            worst[kind] = (rel, key)
        if rel > rtol:
            errors.append(f"{key}: Linux {a!r}, Windows {b!r}, relative difference {rel:.3g} > {rtol:g}")
    print(f"{len(linux)} values, {identical} bit-identical; largest relative difference: steady run "
          f"{worst['steady'][0]:.3g} {worst['steady'][1]}, stepped run {worst['step'][0]:.3g} {worst['step'][1]}")
    for e in errors[:20]:
        print("FAILED:", e, file=sys.stderr)
    return 1 if errors else 0


if __name__ == "__main__":
    sys.exit(main())
