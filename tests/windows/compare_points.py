#!/usr/bin/python3
"""Compares the output of points.c built for Linux and for Windows (run under Wine).

Lines: "<plant> <spec> <drive> status <s> <name> <value> ...". Statuses and names must be
equal; values equal to 1e-12 relative (absolute 1e-300 for zeros). Exactly 50 points.
"""
import sys


def parse(path):
    with open(path, encoding="utf-8") as f:
        lines = [line.rstrip("\r\n") for line in f if line.strip()]
    header = [line for line in lines if line.startswith("abi ")]
    points = [line.split() for line in lines if not line.startswith(("abi ", "points "))]
    return header, points


def close(a, b):
    return a == b or abs(a - b) <= 1e-12 * max(abs(a), abs(b)) or abs(a - b) < 1e-300


def main(linux_path, windows_path):
    lh, lp = parse(linux_path)
    wh, wp = parse(windows_path)
    errors = []
    if lh != wh:
        errors.append(f"library versions differ: {lh} vs {wh}")
    if len(lp) != 50 or len(wp) != 50:
        errors.append(f"expected 50 points, got {len(lp)} (Linux) and {len(wp)} (Windows)")
    worst = 0.0
    compared = 0
    for k, (a, b) in enumerate(zip(lp, wp)):
        if a[:2] != b[:2] or a[3:5] != b[3:5] or len(a) != len(b):
            errors.append(f"point {k}: {' '.join(a[:5])} vs {' '.join(b[:5])}")
            continue
        for i in range(2, len(a), 1):
            if i in (3, 4) or (i > 4 and (i - 5) % 2 == 0):
                if a[i] != b[i]:
                    errors.append(f"point {k}: field {a[i]} vs {b[i]}")
                continue
            x, y = float(a[i]), float(b[i])
            compared += 1
            if x != y:
                worst = max(worst, abs(x - y) / max(abs(x), abs(y)))
            if not close(x, y):
                errors.append(f"point {k} ({a[0]} {a[1]}), {a[i - 1] if i > 4 else 'drive'}: "
                              f"Linux {x!r}, Windows {y!r}")
    for e in errors:
        print("FAILED:", e, file=sys.stderr)
    print(f"{len(lp)} points, {compared} values compared; largest relative difference {worst:.3g}")
    return 1 if errors else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1], sys.argv[2]))
