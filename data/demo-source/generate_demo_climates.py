#!/usr/bin/env python3
"""Generate limitline's two invented demo climates, Harbourside and Mesa Alta.

Neither place exists. These files are demo data: they let `limitline` run out of the box
and show how high-limit strategies behave in a humid and in a dry climate. They are not
measured weather, not typical-year files, and never a source of check values or design
conditions.

What the model does, for each hour of one non-leap year (8760 rows, hour 0-23 = hour
beginning, local standard time):

  dry-bulb  = seasonal mean (annual harmonic)
            + diurnal swing (asymmetric: coolest near sunrise, warmest mid-afternoon),
              whose size is scaled by a slowly varying "cloudiness" state
            + synoptic anomaly (AR(1) process, a few days' memory: warm and cold spells)
            + small hour-to-hour wobble (AR(1), a few hours' memory)
  dew point = seasonal mean + small diurnal term + its own synoptic anomaly, correlated
              with the dry-bulb anomaly (warm spells bring moister air at the coast), then
              kept below the dry-bulb by a smooth floor on the dew-point depression, so it
              never exceeds the dry-bulb and humid nights approach saturation gradually
  pressure  = standard pressure of the site elevation, ASHRAE Handbook-Fundamentals
              (2017) ch.1 eq. 3, p = 101.325*(1 - 2.25577e-5*Z)^5.2559 kPa,
              plus a slow AR(1) weather anomaly (larger in winter), scaled with the site
              pressure

Every random number comes from one random.Random per climate with a fixed seed, so the
output is identical on every run and platform (Python 3 standard library only).

Regenerate from the repository root:

    python3 data/demo-source/generate_demo_climates.py

It rewrites data/demo/harbourside.csv and data/demo/mesa-alta.csv and prints a short
summary of each climate. See data/demo-source/README.md for the climates themselves.
"""

import math
import os
import random
import sys

HOURS_PER_YEAR = 8760
DAYS_IN_MONTH = (31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31)  # non-leap year
HEADER = "month,day,hour,dry_bulb_c,dew_point_c,pressure_kpa"

# Day of year (0-based) of the longest day. Sunrise, the size of the daily swing and the
# spread of the weather noise follow the sun; the seasonal means of dry-bulb and dew point
# lag behind it and have their own peak day in each climate.
SUMMER_SOLSTICE_DAY = 171

# Each climate is a table of parameters, not code: add a climate by adding an entry.
#   seed                 fixed PRNG seed of this climate
#   elevation_m          site elevation for the standard pressure (eq. 3)
#   t_mean_c, t_amp_c    annual mean dry-bulb, half the summer-minus-winter difference
#   t_peak_day           day of year of the warmest seasonal mean
#   range_winter_c/summer_c  mean daily dry-bulb range (max - min) in winter / summer
#   t_sd_winter_c/summer_c   standard deviation of the synoptic dry-bulb anomaly
#   t_memory_h           e-folding memory of the synoptic anomaly, hours
#   d_mean_c, d_amp_c, d_peak_day  seasonal dew point, as for dry-bulb
#   d_sd_winter_c/summer_c   standard deviation of the synoptic dew-point anomaly
#   d_memory_h           memory of the dew-point anomaly, hours
#   d_t_correlation      correlation of the dew-point anomaly with the dry-bulb anomaly
#   d_diurnal_c          dew point swing over the day (positive: afternoon moister)
#   min_depression_c     smallest dew-point depression the floor allows (near-fog nights)
#   p_sd_winter_kpa/summer_kpa  standard deviation of the sea-level pressure anomaly
#   p_memory_h           memory of the pressure anomaly, hours
CLIMATES = (
    {
        "name": "Harbourside",
        "file": "harbourside.csv",
        "seed": 20240611,
        "elevation_m": 10.0,
        # Mild maritime winters (about 5/11 degC), warm humid summers (about 23/30 degC).
        "t_mean_c": 17.0,
        "t_amp_c": 9.0,
        "t_peak_day": 205,
        "range_winter_c": 6.0,
        "range_summer_c": 7.0,
        "t_sd_winter_c": 3.0,
        "t_sd_summer_c": 1.6,
        "t_memory_h": 60.0,
        # Summer dew points around 21-22 degC: sea air, humid even at night.
        "d_mean_c": 12.5,
        "d_amp_c": 9.3,
        "d_peak_day": 210,
        "d_sd_winter_c": 3.5,
        "d_sd_summer_c": 1.4,
        "d_memory_h": 48.0,
        "d_t_correlation": 0.6,
        "d_diurnal_c": 0.8,
        "min_depression_c": 0.3,
        "p_sd_winter_kpa": 0.9,
        "p_sd_summer_kpa": 0.45,
        "p_memory_h": 50.0,
    },
    {
        "name": "Mesa Alta",
        "file": "mesa-alta.csv",
        "seed": 19710423,
        "elevation_m": 1800.0,
        # Cold clear winters (about -8/8 degC), hot dry summer days (about 15/32 degC).
        "t_mean_c": 11.5,
        "t_amp_c": 11.5,
        "t_peak_day": 198,
        "range_winter_c": 16.0,
        "range_summer_c": 17.0,
        "t_sd_winter_c": 3.8,
        "t_sd_summer_c": 2.0,
        "t_memory_h": 72.0,
        # Thin dry air: summer dew points mostly 0-10 degC, well below zero in winter.
        "d_mean_c": -2.5,
        "d_amp_c": 6.5,
        "d_peak_day": 215,
        "d_sd_winter_c": 4.0,
        "d_sd_summer_c": 3.2,
        "d_memory_h": 60.0,
        "d_t_correlation": 0.2,
        "d_diurnal_c": -1.5,
        "min_depression_c": 1.0,
        "p_sd_winter_kpa": 0.6,
        "p_sd_summer_kpa": 0.35,
        "p_memory_h": 60.0,
    },
)


def standard_pressure_kpa(elevation_m):
    # ASHRAE Handbook-Fundamentals (2017) ch.1 eq. 3.
    return 101.325 * (1.0 - 2.25577e-5 * elevation_m) ** 5.2559


def seasonal(day, mean, amplitude, peak_day):
    return mean + amplitude * math.cos(2.0 * math.pi * (day - peak_day) / 365.0)


def summer_weight(day, peak_day):
    """0 in the depth of winter, 1 at the height of summer."""
    return 0.5 * (1.0 + math.cos(2.0 * math.pi * (day - peak_day) / 365.0))


def diurnal_shape(hour_mid, coolest_hour, warmest_hour):
    """-1 at the coolest hour, +1 at the warmest: a half cosine up, a slower one down.

    Air warms quickly after sunrise and cools slowly through the evening and night, so the
    rising half is shorter than the falling half.
    """
    rise = warmest_hour - coolest_hour
    since_coolest = (hour_mid - coolest_hour) % 24.0
    if since_coolest <= rise:
        return -math.cos(math.pi * since_coolest / rise)
    return math.cos(math.pi * (since_coolest - rise) / (24.0 - rise))


class Ar1:
    """Stationary AR(1) noise of unit standard deviation and e-folding memory `memory_h`."""

    def __init__(self, rng, memory_h):
        self.rng = rng
        self.phi = math.exp(-1.0 / memory_h)
        self.innovation = math.sqrt(1.0 - self.phi * self.phi)
        self.value = rng.gauss(0.0, 1.0)

    def step(self, shock=None):
        if shock is None:
            shock = self.rng.gauss(0.0, 1.0)
        self.value = self.phi * self.value + self.innovation * shock
        return self.value


class Synoptic:
    """Unit-variance weather anomaly: two AR(1) stages in series.

    One AR(1) stage alone jumps as much from one hour to the next as its shocks do; feeding
    it through a second stage smooths the hourly steps into fronts and spells that build and
    fade over a day or two, while keeping a memory of a few days. For two stages with the
    same pole phi the output variance is (1 + phi^2)/(1 - phi^2)^3 per unit shock variance,
    which sets the scale. The state is spun up before the year starts so 1 January is
    ordinary weather, not a special calm start.
    """

    def __init__(self, rng, memory_h):
        self.rng = rng
        self.phi = math.exp(-2.0 / memory_h)  # two stages: each with half the memory
        phi2 = self.phi * self.phi
        self.scale = math.sqrt((1.0 - phi2) ** 3 / (1.0 + phi2))
        self.inner = 0.0
        self.outer = 0.0
        for _ in range(int(10 * memory_h)):
            self.step()

    def step(self, shock=None):
        if shock is None:
            shock = self.rng.gauss(0.0, 1.0)
        self.inner = self.phi * self.inner + shock
        self.outer = self.phi * self.outer + self.inner
        return self.scale * self.outer


def smooth_floor(x, floor, softness):
    """max(x, floor) with the corner rounded over about `softness`."""
    z = (x - floor) / softness
    if z > 30.0:
        return x
    return floor + softness * math.log1p(math.exp(z))


def calendar():
    for month, days in enumerate(DAYS_IN_MONTH, start=1):
        for day in range(1, days + 1):
            for hour in range(24):
                yield month, day, hour


def fmt(value, decimals):
    text = f"{value:.{decimals}f}"
    # A value that rounds to zero from below would print as "-0.0".
    if float(text) == 0.0:
        text = f"{0.0:.{decimals}f}"
    return text


def generate(climate):
    rng = random.Random(climate["seed"])
    c = climate
    p_site = standard_pressure_kpa(c["elevation_m"])
    t_synoptic = Synoptic(rng, c["t_memory_h"])
    t_wobble = Ar1(rng, 4.0)
    d_synoptic = Synoptic(rng, c["d_memory_h"])
    d_wobble = Ar1(rng, 4.0)
    cloud = Synoptic(rng, 36.0)
    p_weather = Synoptic(rng, c["p_memory_h"])
    rho = c["d_t_correlation"]
    rows = []
    for index, (month, day, hour) in enumerate(calendar()):
        doy = index // 24
        hour_mid = hour + 0.5  # hour beginning: the value stands for the whole hour
        summer = summer_weight(doy, SUMMER_SOLSTICE_DAY)

        t_shock = rng.gauss(0.0, 1.0)
        t_anom = t_synoptic.step(t_shock)
        # Dew point shares part of its shock with the dry-bulb: warm spells are moister.
        d_shock = rho * t_shock + math.sqrt(1.0 - rho * rho) * rng.gauss(0.0, 1.0)
        d_anom = d_synoptic.step(d_shock)

        # Sunrise is earlier in summer, so the coolest hour is too.
        coolest = 6.5 - 1.2 * (2.0 * summer - 1.0)
        warmest = 15.0
        # Cloudy spells (cloud state high) shrink the daily swing, clear spells widen it.
        swing_scale = min(1.35, max(0.35, 1.0 - 0.28 * cloud.step()))
        daily_range = c["range_winter_c"] + (c["range_summer_c"] - c["range_winter_c"]) * summer
        shape = diurnal_shape(hour_mid, coolest, warmest)

        t_sd = c["t_sd_winter_c"] + (c["t_sd_summer_c"] - c["t_sd_winter_c"]) * summer
        dry_bulb = (seasonal(doy, c["t_mean_c"], c["t_amp_c"], c["t_peak_day"])
                    + 0.5 * daily_range * swing_scale * shape
                    + t_sd * t_anom
                    + 0.4 * t_wobble.step())

        d_sd = c["d_sd_winter_c"] + (c["d_sd_summer_c"] - c["d_sd_winter_c"]) * summer
        dew_raw = (seasonal(doy, c["d_mean_c"], c["d_amp_c"], c["d_peak_day"])
                   + 0.5 * c["d_diurnal_c"] * shape
                   + d_sd * d_anom
                   + 0.3 * d_wobble.step())
        depression = smooth_floor(dry_bulb - dew_raw, c["min_depression_c"], 0.8)
        dew_point = dry_bulb - depression

        p_sd = c["p_sd_winter_kpa"] + (c["p_sd_summer_kpa"] - c["p_sd_winter_kpa"]) * summer
        pressure = p_site + p_sd * (p_site / 101.325) * p_weather.step()

        db_text = fmt(dry_bulb, 1)
        dp_text = fmt(dew_point, 1)
        # Rounding must never lift the dew point above the dry-bulb.
        if float(dp_text) > float(db_text):
            dp_text = db_text
        rows.append((month, day, hour, db_text, dp_text, fmt(pressure, 2)))
    return rows


def write(path, rows):
    with open(path, "w", encoding="ascii", newline="\n") as out:
        out.write(HEADER + "\n")
        for month, day, hour, db, dp, p in rows:
            out.write(f"{month},{day},{hour},{db},{dp},{p}\n")


def summarise(name, rows):
    db = [float(r[3]) for r in rows]
    dp = [float(r[4]) for r in rows]
    p = [float(r[5]) for r in rows]
    cool_humid = sum(1 for t, d in zip(db, dp) if t < 24.0 and d > 16.0)
    print(f"{name}: {len(rows)} rows")
    print(f"  dry-bulb  min {min(db):6.1f}  mean {sum(db) / len(db):6.1f}  max {max(db):6.1f} degC")
    print(f"  dew point min {min(dp):6.1f}  mean {sum(dp) / len(dp):6.1f}  max {max(dp):6.1f} degC")
    print(f"  pressure  min {min(p):6.2f}  mean {sum(p) / len(p):6.2f}  max {max(p):6.2f} kPa")
    print(f"  hours dry-bulb < 24 degC with dew point > 16 degC: {cool_humid}")


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    out_dir = os.path.normpath(os.path.join(here, "..", "demo"))
    if not os.path.isdir(out_dir):
        sys.exit(f"error: output folder {out_dir} does not exist (expected data/demo)")
    for climate in CLIMATES:
        rows = generate(climate)
        if len(rows) != HOURS_PER_YEAR:
            sys.exit(f"error: {climate['name']} produced {len(rows)} rows, expected {HOURS_PER_YEAR}")
        write(os.path.join(out_dir, climate["file"]), rows)
        summarise(climate["name"], rows)


if __name__ == "__main__":
    main()
