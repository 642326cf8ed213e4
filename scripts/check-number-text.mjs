// Checks the built writeNumber (dist/io/number-text.js) against String() on
// as many numbers as asked (4 per round, of every kind; src/io/number-samples.ts).
//   node scripts/check-number-text.mjs [ROUNDS] [SEED]
import { numberSamples } from '../dist/io/number-samples.js';
import { LONGEST_NUMBER, writeNumber } from '../dist/io/number-text.js';
import { seededUniform } from '../dist/random.js';

const rounds = Number(process.argv[2] ?? 10_000_000);
const seed = Number(process.argv[3] ?? 1);
const bytes = new Uint8Array(LONGEST_NUMBER + 8);
let count = 0;
let wrong = 0;
const started = performance.now();
numberSamples(seededUniform(seed), rounds, (v) => {
  count++;
  const text = Buffer.from(bytes.subarray(0, writeNumber(v, bytes, 0, false))).toString('latin1');
  const want = Number.isNaN(v) ? '' : String(v);
  if (text !== want && wrong++ < 20) console.log(`${want} written as ${text}`);
});
console.log(`${count} numbers, ${wrong} written otherwise than String() writes them, seed ${seed}, ${((performance.now() - started) / 1000).toFixed(0)} s`);
process.exitCode = wrong === 0 ? 0 : 1;
