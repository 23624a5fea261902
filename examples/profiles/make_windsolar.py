#!/usr/bin/python3
"""Writes windsolar-year.csv: a year of hourly power for the demo plant (examples/demo-plant.json)
from an invented wind farm and solar park of the demo scenario, and the ambient temperature.

Everything here is invented for the demo; no measured data is used. The numbers are chosen to
look like a mid-latitude site, not taken from one:

- Wind: hourly wind speed at hub height from a first-order autoregressive process (hourly
  correlation 0.97) of a Gaussian, mapped onto a Weibull distribution (shape 2.0, scale 8.5 m/s)
  and varied by season (+15 % in winter, -15 % in summer). A generic turbine curve: nothing
  below 3 m/s, the cube of the speed up to rated power at 12 m/s, rated power to 25 m/s, nothing
  above (cut-out). 30 MW of turbines.
- Solar: the clear-sky power follows the sun's elevation at 50 degrees north (declination by
  Cooper's formula, hour angle 15 degrees per hour, solar noon at 12:00), scaled by a daily
  cloudiness drawn from a beta distribution with its own day-to-day correlation. 20 MW of panels.
- Ambient temperature: 10 degC mean, 9 K seasonal swing (coldest in mid-January), 4 K between
  night and afternoon, and an autoregressive weather term.
- The plant takes what the wind farm and the solar park give, up to its stacks' rated DC power
  (about 25.6 MW at 2.5 A/cm2), less 3 % for the rectifier and the balance of plant.

Run: /usr/bin/python3 examples/profiles/make_windsolar.py  (numpy; fixed seed, so the file is the
same every time). The command line runs it:
    elyblock run examples/demo-plant.json examples/profiles/windsolar-year.csv --set in.mode_request=3
"""
import math
import pathlib

import numpy as np

SEED = 20240611
HOURS = 8760
WIND_MW, SOLAR_MW = 30.0, 20.0
STACKS_DC_MW = 25.6          # the demo plant's rated DC power (2.5 A/cm2, 10 x 250 cells of 0.2 m2)
SHARE_TO_STACKS = 0.97       # what is left for the stacks after the rectifier and the balance of plant


def wind_power(rng, hours):
    # A Gaussian AR(1) process, turned into Weibull-distributed speeds through the normal CDF.
    phi = 0.97
    z = np.empty(hours)
    z[0] = rng.standard_normal()
    noise = rng.standard_normal(hours) * np.sqrt(1 - phi * phi)
    for k in range(1, hours):
        z[k] = phi * z[k - 1] + noise[k]
    u = 0.5 * (1 + np.vectorize(math.erf)(z / np.sqrt(2)))
    u = np.clip(u, 1e-12, 1 - 1e-12)
    speed = 8.5 * (-np.log(1 - u)) ** (1 / 2.0)
    season = 1 + 0.15 * np.cos(2 * np.pi * (np.arange(hours) / HOURS - 15 / 365))  # windier in winter
    speed *= season
    power = np.where(speed < 3, 0.0, np.minimum(1.0, ((speed - 3) / (12 - 3)) ** 3))
    power = np.where(speed > 25, 0.0, power)
    return WIND_MW * power


def solar_power(rng, hours):
    h = np.arange(hours)
    day = h // 24
    declination = np.radians(23.45) * np.sin(2 * np.pi * (284 + day + 1) / 365)  # Cooper (1969)
    latitude = np.radians(50.0)
    hour_angle = np.radians(15.0 * ((h % 24) + 0.5 - 12))
    sin_elevation = np.sin(latitude) * np.sin(declination) + np.cos(latitude) * np.cos(declination) * np.cos(hour_angle)
    clear = np.clip(sin_elevation, 0, None)
    # Daily cloudiness: a beta-distributed clear-sky share, correlated from day to day.
    days = hours // 24 + 1
    share = np.empty(days)
    share[0] = rng.beta(2.0, 1.5)
    for d in range(1, days):
        share[d] = 0.5 * share[d - 1] + 0.5 * rng.beta(2.0, 1.5)
    return SOLAR_MW * clear * share[day]


def ambient(rng, hours):
    h = np.arange(hours)
    seasonal = -9.0 * np.cos(2 * np.pi * (h / HOURS - 15 / 365))
    daily = -4.0 * np.cos(2 * np.pi * ((h % 24) - 3) / 24)
    weather = np.empty(hours)
    weather[0] = 0.0
    noise = rng.standard_normal(hours) * 0.6
    for k in range(1, hours):
        weather[k] = 0.98 * weather[k - 1] + noise[k]
    return 10.0 + seasonal + daily + weather


def main():
    rng = np.random.default_rng(SEED)
    wind = wind_power(rng, HOURS)
    solar = solar_power(rng, HOURS)
    temperature = ambient(rng, HOURS)
    power = np.minimum(STACKS_DC_MW, SHARE_TO_STACKS * (wind + solar))
    out = pathlib.Path(__file__).with_name("windsolar-year.csv")
    with out.open("w") as f:
        f.write("# A year of hourly DC power for the demo plant from an invented wind farm (30 MW) and solar park\n")
        f.write("# (20 MW) of the demo scenario, and the ambient temperature; written by make_windsolar.py (seed\n")
        f.write(f"# {SEED}). Invented for the demo: no measured data. Each row holds until the next one.\n")
        f.write("time [h],power [MW],in.ambient_temperature [degC]\n")
        for k in range(HOURS):
            f.write(f"{k},{power[k]:.4f},{temperature[k]:.2f}\n")
        f.write(f"{HOURS},{power[-1]:.4f},{temperature[-1]:.2f}\n")  # the end of the year
    print(f"wrote {out}: mean power {power.mean():.2f} MW, full-load hours {power.sum() / STACKS_DC_MW:.0f} h, "
          f"hours below 10 % of rated {np.sum(power < 0.1 * STACKS_DC_MW)}")


if __name__ == "__main__":
    main()
