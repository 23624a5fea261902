"""Plots of a plant with matplotlib.

Built on matplotlib's object-oriented API: a function draws into the ``ax`` it is given (from
pyplot or anywhere) or into a new ``matplotlib.figure.Figure``, which needs no display and no
backend to be saved (``save`` writes PNG and SVG). Every function returns the figure; the data
it drew are on its artists, and come from one batch call of the block.

Plot units (fixed, so that figures compare): current density in A/cm2, voltage in V,
efficiency and load in %, specific energy in kWh/kg (1 kWh = 3.6 MJ exactly).

From a shell: ``python3 -m elyblock.plots polarization PLANT.json -o curve.png -o curve.svg``
(or ``efficiency``).

Planned, when the library has profile runs and fits: the duration curve of a profile run and
its temperature and purity traces (from the DataFrame ``Block.simulate`` returns), and a fit
with its residuals (from ``Block.fit``'s result); they take those results, not a plant.
"""
import argparse
import os
import sys
import warnings

import numpy as np
from matplotlib.figure import Figure

from .block import Block
from .errors import ElyError, ElyWarning

#: The parts of the cell voltage, bottom to top of the stacked areas: (label, how to get it from a
#: batch result). Their sum is cell.voltage (the library's voltage is defined as that sum).
VOLTAGE_PARTS = (
    ("reversible", lambda r: r["cell.reversible_voltage"]),
    ("anode activation", lambda r: r["cell.activation_anode"]),
    ("cathode activation", lambda r: r["cell.activation_cathode"]),
    ("ohmic", lambda r: r["cell.ohmic"] - r["cell.degradation"]),
    ("degradation", lambda r: r["cell.degradation"]),
    ("concentration", lambda r: r["cell.concentration"]),
)
VOLTAGE_OUTPUTS = ["cell.reversible_voltage", "cell.activation_anode", "cell.activation_cathode", "cell.ohmic",
                   "cell.degradation", "cell.concentration", "cell.voltage"]
EFFICIENCY_OUTPUTS = ["perf.load_fraction", "perf.efficiency_hhv", "perf.efficiency_lhv", "perf.specific_energy",
                      "perf.specific_energy_plant"]

A_PER_M2_IN_A_PER_CM2 = 1e4
J_PER_KWH = 3.6e6
PERCENT = 100.0


def _block(plant):
    return plant if isinstance(plant, Block) else Block(plant)


def _axes(ax, rows=1, size=(7.0, 4.5)):
    """The caller's axes, or new ones on a new Figure (no pyplot)."""
    if ax is not None:
        return ax
    figure = Figure(figsize=size, layout="constrained")
    return figure.subplots(rows, 1, sharex=True) if rows > 1 else figure.add_subplot()


def _sweep(block, current_density, points, inputs, outputs):
    """One batch over current density (A/m2) at the current-density spec: the results of the
    points that solved, with their current density under "in.current_density"."""
    if current_density is None:  # denser at low current, where the activation losses bend the curve
        current_density = np.linspace(0.0, 1.0, points) ** 2 * block["param.current_density_max"]
    j = np.asarray(current_density, dtype=np.float64).ravel()
    columns = {"in.current_density": j}
    columns.update(inputs or {})
    with warnings.catch_warnings():  # points that fail (below a cell's smallest current) are left out, as documented
        warnings.simplefilter("ignore", ElyWarning)
        result = block.batch(columns, outputs, spec="current_density", with_status=True, progress=False)
    solved = np.ravel(result["status"]) >= 0
    kept = {name: np.ravel(values)[solved] for name, values in result.items()}
    kept["in.current_density"] = np.broadcast_to(j, solved.shape)[solved]
    return kept


def polarization(plant, current_density=None, *, points=60, inputs=None, ax=None, title=None):
    """Polarization curve with its voltage breakdown as stacked areas (reversible voltage,
    activation at each electrode, ohmic without and with degradation, concentration), the cell
    voltage drawn on top. ``current_density`` in A/m2 (default: 0 to the plant's maximum, denser at
    low current density);
    ``inputs``: other batch inputs (e.g. ``{"in.temperature": 343.15}``). Points that fail to
    solve are left out."""
    block = _block(plant)
    r = _sweep(block, current_density, points, inputs, VOLTAGE_OUTPUTS)
    x = r["in.current_density"]
    ax = _axes(ax)
    ax.stackplot(x / A_PER_M2_IN_A_PER_CM2, *[part(r) for _, part in VOLTAGE_PARTS],
                 labels=[label for label, _ in VOLTAGE_PARTS], alpha=0.75)
    ax.plot(x / A_PER_M2_IN_A_PER_CM2, r["cell.voltage"], color="black", linewidth=1.6, label="cell voltage")
    ax.set_xlabel("current density [A/cm²]")
    ax.set_ylabel("cell voltage [V]")
    ax.set_xlim(x.min() / A_PER_M2_IN_A_PER_CM2, x.max() / A_PER_M2_IN_A_PER_CM2)
    # The reversible voltage is most of the cell voltage: start the axis near it so the losses show.
    ax.set_ylim(0.8 * np.min(r["cell.reversible_voltage"]), 1.03 * np.max(r["cell.voltage"]))
    ax.grid(alpha=0.3)
    ax.legend(loc="lower right", fontsize="small")
    ax.set_title(title if title is not None else "polarization curve and voltage breakdown")
    return ax.figure


def efficiency(plant, load=None, *, points=40, inputs=None, axes=None, title=None):
    """Efficiency (HHV and LHV, on DC power plus the heat supplied) and specific energy (DC stack
    and AC plant) against load, the current density over the plant's rated current density.
    ``load`` as fractions (default 5 % to 100 %); ``axes``: two axes to draw into (efficiency,
    specific energy)."""
    block = _block(plant)
    if load is None:
        load = np.linspace(0.05, 1.0, points)
    current_density = np.asarray(load, dtype=np.float64) * block["param.limits.rated_current_density"]
    r = _sweep(block, current_density, points, inputs, EFFICIENCY_OUTPUTS)
    top, bottom = _axes(axes, rows=2, size=(7.0, 6.5))
    x = r["perf.load_fraction"] * PERCENT
    top.plot(x, r["perf.efficiency_hhv"] * PERCENT, label="HHV basis")
    top.plot(x, r["perf.efficiency_lhv"] * PERCENT, label="LHV basis")
    top.set_ylabel("efficiency, DC + heat supplied [%]")
    bottom.plot(x, r["perf.specific_energy"] / J_PER_KWH, label="DC stack")
    bottom.plot(x, r["perf.specific_energy_plant"] / J_PER_KWH, label="AC plant")
    bottom.set_ylabel("specific energy [kWh/kg H₂]")
    bottom.set_xlabel("load: current density / rated [%]")
    for a in (top, bottom):
        a.grid(alpha=0.3)
        a.legend(fontsize="small")
    top.set_title(title if title is not None else "efficiency and specific energy against load")
    return top.figure


def save(figure, path, formats=("png", "svg"), dpi=150):
    """Writes the figure. A path with a .png, .svg or .pdf suffix is written as given; otherwise
    one file per format is written beside it (``path.png``, ``path.svg``). Returns the paths."""
    path = os.fspath(path)
    stem, suffix = os.path.splitext(path)
    targets = [path] if suffix.lower() in (".png", ".svg", ".pdf") else [f"{path}.{f}" for f in formats]
    for target in targets:
        figure.savefig(target, dpi=dpi)
    return targets


PLOTS = {"polarization": polarization, "efficiency": efficiency}


def main(argv=None):
    parser = argparse.ArgumentParser(prog="python3 -m elyblock.plots",
                                     description="Plot a plant description to PNG/SVG files.")
    parser.add_argument("plot", choices=sorted(PLOTS))
    parser.add_argument("plant", help="plant description (JSON file)")
    parser.add_argument("-o", "--output", action="append", required=True,
                        help="file to write (.png, .svg or .pdf); may be given more than once")
    parser.add_argument("--points", type=int, default=None, help="number of operating points")
    args = parser.parse_args(argv)
    options = {} if args.points is None else {"points": args.points}
    try:
        figure = PLOTS[args.plot](args.plant, **options)
    except ElyError as e:
        print(f"{parser.prog}: {e}", file=sys.stderr)
        return 1
    for output in args.output:
        for written in save(figure, output):
            print(written)
    return 0


if __name__ == "__main__":
    sys.exit(main())
