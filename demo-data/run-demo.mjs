#!/usr/bin/env node
// npm run demo: adjusts the synthetic enzyme-stabiliser screen (see
// make-demo.mjs) within storage temperatures with seven procedures, then uses
// the known truth, which only synthetic data has, to show what each
// procedure achieved: discoveries, false discoveries, and the false
// discovery proportion.
import { spawnSync } from 'node:child_process';
import { mkdirSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const cli = join(here, '..', 'dist', 'cli', 'famwise.mjs');
const input = join(here, 'enzyme-screen.csv');
const outDir = join(here, 'output');
mkdirSync(outDir, { recursive: true });
const output = join(outDir, 'enzyme-screen-adjusted.csv');
const summary = join(outDir, 'summary.json');
const methods = ['bonferroni', 'sidak', 'holm', 'holm-sidak', 'hochberg', 'hommel', 'bh', 'by', 'storey', 'bky'];

const args = ['adjust', input, '--family', 'storage_temp', '--methods', methods.join(','), '--alpha', '0.05', '-o', output, '--summary', summary];
console.log('SYNTHETIC DEMO DATA: an invented enzyme-stabiliser screen, 600 additives x 3 storage temperatures.\n');
console.log(`$ famwise ${args.map((arg) => arg.replace(`${here}/`, 'demo-data/')).join(' ')}\n`);
const run = spawnSync(process.execPath, [cli, ...args], { encoding: 'utf8' });
process.stderr.write(run.stderr);
if (run.status !== 0) process.exit(run.status ?? 1);

// The demo table has no quoted fields, so a plain split reads it.
const [headerLine, ...lines] = readFileSync(output, 'utf8').trimEnd().split('\n');
const header = headerLine.split(',');
const col = (name) => header.indexOf(name);
const rows = lines.map((line) => line.split(','));

console.log('\nWhat the truth column says (only synthetic data has one):');
console.log('temperature  method      rejected  false  FDP    any false rejection  active found');
for (const temperature of ['4C', '25C', '37C']) {
  const family = rows.filter((row) => row[col('storage_temp')] === temperature);
  for (const method of methods) {
    const rejected = family.filter((row) => row[col(`rej_${method.replaceAll('-', '_')}`)] === 'true');
    const falses = rejected.filter((row) => row[col('truly_active')] === 'false').length;
    const fdp = rejected.length === 0 ? 0 : falses / rejected.length;
    const active = family.filter((row) => row[col('truly_active')] === 'true').length;
    const found = `${rejected.length - falses} of ${active}`;
    console.log(
      `${temperature.padEnd(11)}  ${method.padEnd(10)}  ${String(rejected.length).padStart(8)}  ${String(falses).padStart(5)}  ${fdp.toFixed(3)}  ${(falses > 0 ? 'yes' : 'no').padEnd(19)}  ${found}`,
    );
  }
}
console.log(`
FWER procedures (bonferroni to hommel) aim to make even one false rejection
unlikely; FDR procedures (bh, by) let a small share of the rejections be false in
exchange for more discoveries. The adaptive FDR procedures (storey, bky) estimate
the share of true nulls (pi0 in the summary) and gain most where it is lowest.
One synthetic run shows one outcome, not the rates.

The adjusted table: ${output.replace(`${here}/`, 'demo-data/')}
The summary as JSON: ${summary.replace(`${here}/`, 'demo-data/')}`);
