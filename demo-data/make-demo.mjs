#!/usr/bin/env node
// Writes demo-data/enzyme-screen.csv: SYNTHETIC data for the demo only.
//
// The invented scenario: a lab screens 600 candidate additives for whether
// they protect an enzyme during storage. Each additive is stored at three
// temperatures (4C, 25C, 37C), and residual activity is compared with
// untreated controls by a z-test, giving one two-sided p-value per additive
// and temperature. Each temperature is its own family of 600 tests. Some
// additives truly work (more of them at the warmer, harsher temperatures);
// the column truly_active records that truth, which a real screen never
// knows, so that the demo can show the false discovery proportion each
// procedure actually achieved. A few wells failed (p-value NA).
//
// Seeded (mulberry32), so every run writes the same bytes.
// Usage: node demo-data/make-demo.mjs > demo-data/enzyme-screen.csv
import jStat from 'jstat';

let state = 20261201;
function random() {
  state = (state + 0x6d2b79f5) >>> 0;
  let t = state;
  t = Math.imul(t ^ (t >>> 15), t | 1);
  t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
  return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
}
function normal() {
  // Box-Muller; 1 - u keeps the logarithm finite.
  return Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
}

const additives = 600;
const temperatures = [
  { name: '4C', activeShare: 0.04, effect: 3.0 },
  { name: '25C', activeShare: 0.1, effect: 3.2 },
  { name: '37C', activeShare: 0.2, effect: 3.5 },
];
const lines = ['additive_id,storage_temp,activity_change_pct,z_score,p_value,truly_active'];
for (const temperature of temperatures) {
  for (let i = 1; i <= additives; i++) {
    const active = random() < temperature.activeShare;
    const z = (active ? temperature.effect : 0) + normal();
    const change = (z * 2.5).toFixed(1);
    const failedWell = random() < 0.01;
    // Two-sided p-value from the upper tail directly, not 1 - cdf.
    const p = failedWell ? 'NA' : (2 * jStat.normal.cdf(-Math.abs(z), 0, 1)).toPrecision(4);
    lines.push(`ADD-${String(i).padStart(4, '0')},${temperature.name},${change},${z.toFixed(3)},${p},${active}`);
  }
}
process.stdout.write(`${lines.join('\n')}\n`);
