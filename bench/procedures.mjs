// Times every procedure on one family of m p-values (sort included), on the
// built library (run `npm run build` first). Not part of npm test.
//   node bench/procedures.mjs [m] [repeats]
import { METHODS } from '../dist/index.js';

const m = Number(process.argv[2] ?? 1_000_000);
const repeats = Number(process.argv[3] ?? 5);

// Seeded mixture: 80% uniform nulls, 20% alternatives near 0 (mulberry32).
let state = 20261201;
function random() {
  state = (state + 0x6d2b79f5) | 0;
  let t = Math.imul(state ^ (state >>> 15), 1 | state);
  t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
  return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
}
const p = new Float64Array(m);
for (let i = 0; i < m; i++) p[i] = random() < 0.8 ? random() : random() ** 6;

console.log(`m = ${m.toLocaleString('en')}, median of ${repeats} runs (sort included), node ${process.version}`);
for (const method of METHODS) {
  method.adjust(p, m); // warm-up
  const times = [];
  for (let r = 0; r < repeats; r++) {
    const start = process.hrtime.bigint();
    method.adjust(p, m);
    times.push(Number(process.hrtime.bigint() - start) / 1e6);
  }
  times.sort((a, b) => a - b);
  console.log(`${method.token.padEnd(12)} ${times[Math.floor(repeats / 2)].toFixed(0).padStart(6)} ms`);
}
