"""Plots of a plant with matplotlib.

Built on matplotlib's object-oriented API: a function draws into the ``ax`` it is given (from
pyplot or anywhere) or into a new ``matplotlib.figure.Figure``, which needs no display and no
backend to be saved (``save`` writes PNG and SVG). Every function returns the figure; the data
it drew are on its artists, and come from one batch call of the block.

Plot units (fixed, so that figures compare): current density in A/cm2, voltage in V,
efficiency and load in %, specific energy in kWh/kg (1 kWh = 3.6 MJ exactly).

From a shell: ``python3 -m elyblock.plots polarization PLANT.json -o curve.png -o curve.svg``
(or ``efficiency``).

``fit(result)`` draws a fit (``Block.fit``'s result, not a plant): the measured points, the
calibrated model as curves and the residuals in a panel below.

A profile run (``Block.simulate(profile, plots.RUN_OUTPUTS)``, a DataFrame or dict with its
time column): ``duration_curve`` (the load against the hours it was reached or exceeded),
``run_traces`` (stack temperature and H2 in the anode gas against time, with the temperature
setpoint and the alarm levels) and ``profile_run`` (all three panels in one figure). A series
written by ``elyblock run`` reads with ``read_series``.

From a shell: ``python3 -m elyblock.plots run SERIES.csv -o run.png`` (a series in SI with the
columns of RUN_OUTPUTS; ``elyblock run --plot`` writes one and calls this).
"""
import argparse
import os
import sys
import textwrap
import warnings

import numpy as np

try:
    from matplotlib.figure import Figure
except ImportError as _e:  # python3-matplotlib is missing
    raise ImportError("elyblock.plots needs matplotlib (Debian: apt-get install python3-matplotlib)") from _e

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
    return voltage_breakdown(r, ax=ax, title=title)


def voltage_breakdown(results, x="in.current_density", unit="A/m2", *, ax=None, title=None):
    """The cell voltage and its parts as stacked areas against ``x`` from results already at hand:
    a mapping (a batch result, a sweep read with ``read_series``) holding ``x`` (SI, in ``unit``)
    and the outputs of VOLTAGE_OUTPUTS. ``polarization`` draws its batch with it; ``elyblock sweep
    --plot`` its sweep."""
    r = {name: np.asarray(results[name], dtype=np.float64) for name in [x] + VOLTAGE_OUTPUTS}
    scale, offset, shown_unit = _plot_scale(x, unit)
    xs = r[x] * scale + offset
    ax = _axes(ax)
    ax.stackplot(xs, *[part(r) for _, part in VOLTAGE_PARTS], labels=[label for label, _ in VOLTAGE_PARTS], alpha=0.75)
    ax.plot(xs, r["cell.voltage"], color="black", linewidth=1.6, label="cell voltage")
    ax.set_xlabel("current density [A/cm²]" if x == "in.current_density" else f"{x} [{shown_unit}]")
    ax.set_ylabel("cell voltage [V]")
    ax.set_xlim(xs.min(), xs.max())
    # The reversible voltage is most of the cell voltage: start the axis near it so the losses show.
    ax.set_ylim(0.8 * np.min(r["cell.reversible_voltage"]), 1.03 * np.max(r["cell.voltage"]))
    ax.grid(alpha=0.3)
    ax.legend(loc="lower right", fontsize="small")
    default = ("polarization curve and voltage breakdown" if x == "in.current_density"
               else f"cell voltage and its breakdown against {x}")
    ax.set_title(title if title is not None else default)
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


KELVIN = 273.15
PA_PER_BAR = 1e5
MV_PER_V = 1e3


def _plot_scale(name, unit):
    """(factor, offset, unit) of the fixed plot units: current density A/cm2, temperature degC,
    pressure bar, voltage V; other quantities in their SI unit."""
    if unit == "A/m2":
        return 1.0 / A_PER_M2_IN_A_PER_CM2, 0.0, "A/cm²"
    if unit == "K":
        return 1.0, -KELVIN, "°C"
    if unit == "Pa":
        return 1.0 / PA_PER_BAR, 0.0, "bar"
    return 1.0, 0.0, unit


def _groups(inputs, others):
    """Rows grouped by the values of the ``others`` input columns: [(values, row indices)]."""
    if not others:
        return [((), np.arange(len(inputs)))]
    keys = inputs[:, others]
    unique, inverse = np.unique(keys, axis=0, return_inverse=True)
    return [(tuple(unique[g]), np.flatnonzero(inverse.ravel() == g)) for g in range(len(unique))]


def fit(result, x="in.current_density", output=None, *, points=60, axes=None, title=None):
    """A fit: the measured values of ``output`` (default cell.voltage when measured, else the first
    measured variable) against the input ``x`` as points, the calibrated model as curves, and the
    residuals (model - measured) in a panel below. Rows with different values of the other inputs
    (temperatures, pressures) are drawn as separate series, each curve one batch of the fitted
    block (``result.block()``) over that series' range of ``x`` at the fit's spec. ``axes``: two
    axes to draw into (values, residuals). Voltages are drawn in V, their residuals in mV."""
    data = result.data
    if x not in data.input_names:
        raise ValueError(f"fit plot: x '{x}' is not an input column of the fit's data ({', '.join(data.input_names)})")
    if output is None:
        output = "cell.voltage" if "cell.voltage" in data.measured_names else data.measured_names[0]
    if output not in data.measured_names:
        raise ValueError(f"fit plot: '{output}' was not measured ({', '.join(data.measured_names)})")
    block = result.block()
    units = {v.name: v.unit for v in block.variables()}
    column = data.input_names.index(x)
    others = [k for k in range(len(data.input_names)) if k != column]
    o = data.measured_names.index(output)
    x_scale, x_offset, x_unit = _plot_scale(x, units[x])
    y_scale, y_offset, y_unit = _plot_scale(output, units[output])
    r_scale, r_unit = (MV_PER_V, "mV") if units[output] == "V" else (y_scale, y_unit)
    residuals = result._residuals[:, o]
    top, bottom = _axes(axes, rows=2, size=(7.0, 6.5))
    for values, rows in _groups(data.inputs, others):
        label = ", ".join(_value_text(data.input_names[k], units[data.input_names[k]], v) for k, v in zip(others, values))
        measured = ~np.isnan(data.measured[rows, o])
        xs = data.inputs[rows, column]
        points_artist, = top.plot(xs[measured] * x_scale + x_offset, data.measured[rows, o][measured] * y_scale + y_offset,
                                  "o", markersize=4, label=f"measured{', ' + label if label else ''}")
        color = points_artist.get_color()
        grid = np.linspace(xs.min(), xs.max(), points)
        curve_inputs = {x: grid}
        curve_inputs.update({data.input_names[k]: v for k, v in zip(others, values)})
        with warnings.catch_warnings():  # points that fail are left out of the curve
            warnings.simplefilter("ignore", ElyWarning)
            curve = block.batch(curve_inputs, [output], spec=result.spec, with_status=True, progress=False)
        solved = curve["status"] >= 0
        top.plot(grid[solved] * x_scale + x_offset, curve[output][solved] * y_scale + y_offset, "-", color=color,
                 linewidth=1.4, label=f"fitted model{', ' + label if label else ''}")
        bottom.plot(xs[measured] * x_scale + x_offset, residuals[rows][measured] * r_scale, "o", color=color,
                    markersize=4)
    bottom.axhline(0.0, color="black", linewidth=0.8)
    top.set_ylabel(f"{output} [{y_unit}]")
    bottom.set_ylabel(f"residual, model − measured [{r_unit}]")
    bottom.set_xlabel(f"{x} [{x_unit}]")
    for a in (top, bottom):
        a.grid(alpha=0.3)
    top.legend(fontsize="small")
    rmse = result.rmse.get(output, np.nan) * r_scale
    short = [n.split(".", 2)[-1] if n.startswith("param.cell.") else n.removeprefix("param.") for n in result.names]
    default = "\n".join(textwrap.wrap(f"fitted: {', '.join(short)}", 70) + [f"RMSE of {output} {rmse:.3g} {r_unit}"])
    top.set_title(title if title is not None else default, fontsize="medium")
    return top.figure


# ---- profile runs ------------------------------------------------------------------------------

#: The outputs the profile plots read from a run (``Block.simulate(profile, RUN_OUTPUTS)``).
RUN_OUTPUTS = ["perf.load_fraction", "stack.power", "stack.temperature", "gas.h2_in_o2", "gas.h2_in_o2_stack",
               "state.mode"]
SECONDS_PER_HOUR = 3600.0
MODE_PRODUCTION = 2  # state.mode
SECONDS_PER_DAY = 86400.0
W_PER_MW = 1e6


def _column(run, name):
    try:
        return np.asarray(run[name], dtype=np.float64)
    except KeyError:
        raise ValueError(f"profile plot: the run has no column '{name}' (simulate with plots.RUN_OUTPUTS)") from None


def row_durations(time):
    """How long each row of a run holds, s: until the next row's time (the last row: 0)."""
    time = np.asarray(time, dtype=np.float64)
    return np.append(np.diff(time), 0.0) if time.size else time


def duration_curve(run, column="perf.load_fraction", *, ax=None, title=None):
    """Load duration curve of a profile run: ``column`` (the load, current density over the rated
    one, in %; or ``stack.power`` in MW) sorted from high to low against the hours for which the
    plant was at that value or above, each row counted for the time it holds (until the next row).
    Returns the figure; the curve's points are (hours, value)."""
    time = _column(run, "time")
    values = _column(run, column)
    held = row_durations(time)
    order = np.argsort(-values, kind="stable")
    hours = np.cumsum(held[order]) / SECONDS_PER_HOUR
    scale, unit = (PERCENT, "%") if column == "perf.load_fraction" else (
        (1 / W_PER_MW, "MW") if column.endswith(".power") else (1.0, ""))
    ax = _axes(ax)
    # A step per row: the value holds over the row's hours.
    ax.step(np.concatenate(([0.0], hours)), np.concatenate((values[order][:1], values[order])) * scale,
            where="pre", color="tab:blue", linewidth=1.4)
    ax.fill_between(np.concatenate(([0.0], hours)), np.concatenate((values[order][:1], values[order])) * scale,
                    step="pre", alpha=0.25, color="tab:blue")
    ax.set_xlim(0.0, hours[-1] if hours.size and hours[-1] > 0 else 1.0)
    ax.set_ylim(bottom=0.0)
    ax.set_xlabel("hours at this value or above [h]")
    label = "load, current density / rated" if column == "perf.load_fraction" else column
    ax.set_ylabel(f"{label} [{unit}]" if unit else label)
    ax.grid(alpha=0.3)
    ax.set_title(title if title is not None else "load duration curve")
    return ax.figure


def _time_axis(time):
    """(factor, unit) of the time axis: hours up to three days, days beyond."""
    span = float(time[-1] - time[0]) if len(time) else 0.0
    return (1 / SECONDS_PER_DAY, "d") if span > 3 * SECONDS_PER_DAY else (1 / SECONDS_PER_HOUR, "h")


def _levels(block, setpoint, warning, trip):
    if block is not None:
        setpoint = block["param.thermal.temperature_setpoint"] if setpoint is None else setpoint
        warning = block["param.alarms.h2_in_o2_warning"] if warning is None else warning
        trip = block["param.alarms.h2_in_o2_trip"] if trip is None else trip
    return setpoint, warning, trip


def run_traces(run, *, block=None, setpoint=None, warning=None, trip=None, axes=None, title=None):
    """Traces of a profile run against time: the stack temperature (°C, with the temperature
    setpoint dashed) and hydrogen in the anode gas (%: the separator's gas, which the alarms
    watch, and the gas leaving the stacks when the run has it, with the warning and trip levels).
    The levels come from ``block`` (the run's Block) unless given (K, mol/mol). ``axes``: two axes
    (temperature, purity). Time in hours, or days for runs longer than three days."""
    time = _column(run, "time")
    setpoint, warning, trip = _levels(block, setpoint, warning, trip)
    factor, unit = _time_axis(time)
    t = (time - time[0]) * factor if len(time) else time
    top, bottom = _axes(axes, rows=2, size=(8.0, 6.0))
    top.plot(t, _column(run, "stack.temperature") - KELVIN, color="tab:red", linewidth=1.0, label="stack")
    if setpoint is not None:
        top.axhline(setpoint - KELVIN, color="black", linestyle="--", linewidth=0.9, label="setpoint")
    top.set_ylabel("stack temperature [°C]")
    separator = _column(run, "gas.h2_in_o2")
    bottom.plot(t, separator * PERCENT, color="tab:purple", linewidth=1.0, label="separator gas (alarms)")
    try:  # the gas leaving the stacks while they produce (without current it is the crossover alone)
        stack = np.asarray(run["gas.h2_in_o2_stack"], dtype=np.float64).copy()
        try:
            stack[np.asarray(run["state.mode"]) != MODE_PRODUCTION] = np.nan
        except KeyError:
            pass
        bottom.plot(t, stack * PERCENT, color="tab:gray", linewidth=0.6, alpha=0.7,
                    label="leaving the stacks, in production")
    except KeyError:
        pass
    for level, name, style in ((warning, "warning", ":"), (trip, "trip", "--")):
        if level is not None:
            bottom.axhline(level * PERCENT, color="tab:orange" if name == "warning" else "tab:red", linestyle=style,
                           linewidth=1.0, label=f"{name} level")
    bottom.set_ylabel("H₂ in the anode gas, dry [%]")
    bottom.set_xlabel(f"time from the start [{unit}]")
    highest = max([np.nanmax(separator) if np.isfinite(separator).any() else 0.0] +
                  [level for level in (warning, trip) if level is not None])
    bottom.set_ylim(0.0, 1.3 * highest * PERCENT if highest > 0 else None)
    for a in (top, bottom):
        a.grid(alpha=0.3)
        a.legend(fontsize="small", loc="upper right")
    top.set_title(title if title is not None else "stack temperature and hydrogen in the anode gas")
    return top.figure


def profile_run(run, *, block=None, setpoint=None, warning=None, trip=None, title=None):
    """One figure of a profile run: the load duration curve above the temperature and purity
    traces (``duration_curve`` and ``run_traces``)."""
    figure = Figure(figsize=(8.0, 9.5), layout="constrained")
    top = figure.add_subplot(3, 1, 1)
    middle = figure.add_subplot(3, 1, 2)
    bottom = figure.add_subplot(3, 1, 3, sharex=middle)
    duration_curve(run, ax=top, title=title if title is not None else "load duration curve")
    run_traces(run, block=block, setpoint=setpoint, warning=warning, trip=trip, axes=(middle, bottom), title="")
    return figure


def read_series(path, plant=None, with_units=False):
    """A run's series from CSV (``elyblock run --output``, or any CSV whose headers read
    ``name [unit]``): {name: array}, the time under "time" in s. With ``plant`` (a Block or a plant
    description) each column with a unit is converted by the library to its variable's SI unit
    (a series written with ``--units engineering``); without, the values are taken as they are
    (``--units si``, the default). A status column is kept as text. ``with_units=True`` also
    returns {name: unit} as the values are (None where the header gives none)."""
    import csv
    from .units import convert_unit
    units = None
    if plant is not None:
        units = {v.name: v.unit for v in _block(plant).variables()}
    with open(path, newline="", encoding="utf-8") as f:
        rows = [r for r in csv.reader(f) if r and not r[0].startswith("#")]
    if not rows:
        raise ValueError(f"{path}: no header")
    series, found = {}, {}
    for k, header in enumerate(rows[0]):
        name, unit = header.strip(), None
        if name.endswith("]") and "[" in name:
            name, unit = name[:name.index("[")].strip(), name[name.index("[") + 1:-1].strip()
        column = [r[k] if k < len(r) else "" for r in rows[1:]]
        if name == "status":
            series[name] = np.array(column)
            continue
        values = np.array([float(v) if v.strip() else np.nan for v in column], dtype=np.float64)
        target = "s" if name == "time" else (units or {}).get(name)
        if unit and target and unit != target:
            values, unit = convert_unit(values, unit, target), target
        series[name] = values
        found[name] = unit
    return (series, found) if with_units else series


def _value_text(name, unit, value):
    scale, offset, shown_unit = _plot_scale(name, unit)
    return f"{name} {value * scale + offset:.4g} {shown_unit}"


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
                                     description="Plot a plant description, or the series of a profile run, to "
                                                 "PNG/SVG files.")
    parser.add_argument("plot", choices=sorted(PLOTS) + ["run", "sweep"],
                        help="polarization or efficiency (of a PLANT.json); run (of a run's SERIES.csv); sweep (the "
                             "voltage breakdown of a sweep's CSV: the swept input first, then VOLTAGE_OUTPUTS, SI)")
    parser.add_argument("plant", help="plant description (JSON file); for 'run' the series CSV (SI, "
                                      "'name [unit]' headers, the columns of RUN_OUTPUTS)")
    parser.add_argument("-o", "--output", action="append", required=True,
                        help="file to write (.png, .svg or .pdf); may be given more than once")
    parser.add_argument("--points", type=int, default=None, help="number of operating points")
    parser.add_argument("--setpoint", type=float, default=None, help="run: temperature setpoint, K")
    parser.add_argument("--warning", type=float, default=None, help="run: H2-in-O2 warning level, mol/mol")
    parser.add_argument("--trip", type=float, default=None, help="run: H2-in-O2 trip level, mol/mol")
    parser.add_argument("--title", default=None, help="title of the figure")
    args = parser.parse_args(argv)
    try:
        if args.plot == "run":
            figure = profile_run(read_series(args.plant), setpoint=args.setpoint, warning=args.warning,
                                 trip=args.trip, title=args.title)
        elif args.plot == "sweep":
            series, units = read_series(args.plant, with_units=True)
            x = next(iter(series))
            figure = voltage_breakdown(series, x, units[x], title=args.title)
        else:
            options = {} if args.points is None else {"points": args.points}
            if args.title is not None:
                options["title"] = args.title
            figure = PLOTS[args.plot](args.plant, **options)
    except (ElyError, ValueError, OSError) as e:
        print(f"{parser.prog}: {e}", file=sys.stderr)
        return 1
    for output in args.output:
        for written in save(figure, output):
            print(written)
    return 0


if __name__ == "__main__":
    sys.exit(main())
