#!/usr/bin/env node
// Reference values from psychrolib (the pinned npm package) for the psychrometric cross-check.
//
// usage: node generate.js OUTPUT.csv [ROWS]
//
// Draws pseudo-random moist-air states from a fixed seed (so every run, on every machine,
// checks the same states) over -40..50 °C dry-bulb, 1..100 % RH and 60..110 kPa, and writes
// what psychrolib computes for each. tests/test_crosscheck_psychrolib.cpp compares limitline
// with these values. Everything written is SI exactly as psychrolib returns it (Pa, J/kg),
// printed with the shortest text that reads back to the same double.
'use strict';

const fs = require('fs');
const path = require('path');

const PINNED = '1.1.1';
const SEED = 0x6c696d69;  // fixed: the check must be reproducible
const DEFAULT_ROWS = 12000;

const out = process.argv[2];
const rows = process.argv[3] === undefined ? DEFAULT_ROWS : Number(process.argv[3]);
if (!out || !Number.isInteger(rows) || rows < 1) {
  process.stderr.write('usage: node generate.js OUTPUT.csv [ROWS]\n');
  process.exit(2);
}

const installed = require('psychrolib/package.json').version;
if (installed !== PINNED) {
  process.stderr.write(`generate.js: psychrolib ${installed} is installed, the cross-check is ` +
                       `pinned to ${PINNED} (run npm ci in ${__dirname})\n`);
  process.exit(1);
}
const psy = require('psychrolib');
psy.SetUnitSystem(psy.SI);

// xorshift32 (Marsaglia 2003): tiny, and the same sequence in every JavaScript engine, which
// Math.random() is not.
let state = SEED >>> 0;
function next() {
  state ^= state << 13; state >>>= 0;
  state ^= state >>> 17;
  state ^= state << 5; state >>>= 0;
  return state / 4294967296;  // [0, 1)
}
const uniform = (lo, hi) => lo + (hi - lo) * next();

const columns = [
  'dry_bulb_c', 'rh', 'pressure_pa', 'elevation_m',
  'hum_ratio', 'enthalpy_j_per_kg', 'dew_point_c', 'wet_bulb_c', 'rh_round_trip',
  'hum_ratio_from_wet_bulb', 'hum_ratio_from_dew_point', 'volume_m3_per_kg',
  'degree_of_saturation', 'standard_pressure_pa',
];
const lines = [
  `# psychrolib ${installed} seed ${SEED} rows ${rows} (SI: Pa, J/kg dry air)`,
  columns.join(','),
];
for (let i = 0; i < rows; ++i) {
  const t = uniform(-40, 50);
  const rh = uniform(0.01, 1.0);
  const p = uniform(60000, 110000);
  const z = uniform(-500, 5000);
  const w = psy.GetHumRatioFromRelHum(t, rh, p);
  const dew = psy.GetTDewPointFromHumRatio(t, w, p);
  const wet = psy.GetTWetBulbFromHumRatio(t, w, p);
  const values = [
    t, rh, p, z,
    w, psy.GetMoistAirEnthalpy(t, w), dew, wet, psy.GetRelHumFromHumRatio(t, w, p),
    psy.GetHumRatioFromTWetBulb(t, wet, p), psy.GetHumRatioFromTDewPoint(dew, p),
    psy.GetMoistAirVolume(t, w, p), psy.GetDegreeOfSaturation(t, w, p),
    psy.GetStandardAtmPressure(z),
  ];
  for (const v of values) {
    if (!Number.isFinite(v)) {
      process.stderr.write(`generate.js: psychrolib returned ${v} for state ${i + 1} ` +
                           `(t=${t}, rh=${rh}, p=${p})\n`);
      process.exit(1);
    }
  }
  lines.push(values.map(String).join(','));
}
fs.mkdirSync(path.dirname(path.resolve(out)), { recursive: true });
fs.writeFileSync(out, lines.join('\n') + '\n');
process.stdout.write(`wrote ${rows} psychrolib ${installed} states to ${out}\n`);
