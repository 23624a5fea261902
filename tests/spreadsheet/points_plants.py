#!/usr/bin/python3
"""Prints the plants of tests/windows/points.c (the 50 points of the Windows test), one per line as
"name<TAB>JSON", read from its `plants` table, so that the VBA-call test solves the same plants
without a copy of them. usage: points_plants.py points.c
"""
import json
import re
import sys


def plants(source):
    table = re.search(r"plants\[\]\[3\]\s*=\s*\{(.*?)\n\};", source, re.S)
    if not table:
        raise SystemExit("points_plants.py: no plants table in the source")
    found = []
    for entry in re.finditer(r'\{\s*"(\w+)",\s*((?:"(?:[^"\\]|\\.)*"\s*)+),\s*"[0-9.]+"\s*\}', table.group(1)):
        pieces = re.findall(r'"((?:[^"\\]|\\.)*)"', entry.group(2))
        text = "".join(pieces).encode().decode("unicode_escape")
        json.loads(text)  # each is a whole JSON document
        found.append((entry.group(1), text))
    return found


def main():
    with open(sys.argv[1], encoding="utf-8") as f:
        found = plants(f.read())
    if len(found) < 2:
        raise SystemExit(f"points_plants.py: {len(found)} plants read from {sys.argv[1]}")
    for name, text in found:
        print(f"{name}\t{text}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
