// Times `famwise adjust --methods bh,holm` on whole tables, from a file and
// from standard input, and optionally the reference R pipeline side by side
// (runs alternate, medians compared). Tables come from
// ../shared/bench/make-table.mjs and are cached in bench-out/tables/ (git
// ignores bench-out/). Peak memory is the maximum resident set size that
// /usr/bin/time reports (Debian package `time`). Not part of npm test.
//
//   node bench/tables.mjs [--rows 1000000,10000000] [--runs 3] [--reference] [--gzip]
//
// --reference  also run Rscript ../shared/bench/r-pipeline.R (needs r-base-core, r-cran-data.table)
// --gzip       also time a gzip copy of each table: from the file (decompressed on both passes)
//              and through `zcat | famwise` (decompressed once, spilled to a temporary file)
import { execFileSync, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { closeSync, existsSync, mkdirSync, openSync, readFileSync, statSync } from 'node:fs';
import { cpus, loadavg, totalmem } from 'node:os';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';

const USAGE = 'usage: node bench/tables.mjs [--rows 1000000,10000000] [--runs 3] [--reference] [--gzip]';
let args;
try {
  ({ values: args } = parseArgs({
    options: {
      rows: { type: 'string', default: '1000000,10000000' },
      runs: { type: 'string', default: '3' },
      reference: { type: 'boolean', default: false },
      gzip: { type: 'boolean', default: false },
      help: { type: 'boolean', short: 'h', default: false },
    },
  }));
} catch (error) {
  console.error(`bench/tables.mjs: ${error.message}\n${USAGE}`);
  process.exit(2);
}
if (args.help) {
  console.log(USAGE);
  process.exit(0);
}
const badNumber = [args.runs, ...args.rows.split(',')].find((text) => !/^[1-9]\d*$/.test(text.trim()));
if (badNumber !== undefined) {
  console.error(`bench/tables.mjs: ${JSON.stringify(badNumber)} is not a whole number above 0\n${USAGE}`);
  process.exit(2);
}
const root = fileURLToPath(new URL('..', import.meta.url));
const shared = fileURLToPath(new URL('../../shared/bench/', import.meta.url));
const cli = `${root}dist/cli/famwise.mjs`;
const folder = `${root}bench-out/tables/`;
mkdirSync(folder, { recursive: true });
const runs = Number(args.runs);
const TIME = '/usr/bin/time';

function table(rows) {
  const path = `${folder}table-${rows}.csv`;
  if (!existsSync(path)) {
    console.error(`writing ${path} with make-table.mjs ...`);
    const fd = openSync(path, 'w');
    execFileSync(process.execPath, [`${shared}make-table.mjs`, String(rows)], { stdio: ['ignore', fd, 'inherit'] });
    closeSync(fd);
  }
  return path;
}

function gzipCopy(path) {
  const gz = `${path}.gz`;
  if (!existsSync(gz)) execFileSync('sh', ['-c', `gzip -1 -c "${path}" > "${gz}"`]);
  return gz;
}

/**
 * Runs a shell command under /usr/bin/time: wall seconds, CPU seconds (user and system, the
 * command's processes together: cat or R included) and peak resident memory (MB, the largest
 * of its processes).
 */
function timed(command) {
  const result = spawnSync(TIME, ['-f', 'famwise-bench %e %M %U %S', 'sh', '-c', command], { encoding: 'utf8' });
  const line = result.stderr.split('\n').find((text) => text.startsWith('famwise-bench '));
  if (result.status !== 0 || !line) throw new Error(`${command} failed:\n${result.stderr}`);
  const [, seconds, kilobytes, user, system] = line.split(' ');
  return { seconds: Number(seconds), rssMb: Number(kilobytes) / 1024, cpu: Number(user) + Number(system) };
}

const median = (values) => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)];

function digest(path) {
  return createHash('sha256').update(readFileSync(path)).digest('hex').slice(0, 16);
}

const famwise = (input, output) => `"${process.execPath}" "${cli}" adjust ${input} --methods bh,holm -q -o "${output}"`;

console.log(`node ${process.version}, ${cpus().length} x ${cpus()[0]?.model ?? 'cpu'}, ${(totalmem() / 2 ** 30).toFixed(0)} GB; load average at start ${loadavg().map((x) => x.toFixed(2)).join(' ')}`);
for (const rows of args.rows.split(',').map(Number)) {
  const path = table(rows);
  const megabytes = statSync(path).size / 1e6;
  const out = `${folder}out-${rows}.csv`;
  const commands = {
    'famwise, file': famwise(`"${path}"`, `${out}.file`),
    // Standard input redirected from the file is read by position; through a pipe it is first kept in a temporary file.
    'famwise, stdin from the file': `${famwise('', `${out}.stdin`)} < "${path}"`,
    'famwise, stdin from a pipe': `cat "${path}" | ${famwise('', `${out}.pipe`)}`,
  };
  if (args.gzip) {
    const gz = gzipCopy(path);
    commands['famwise, .gz file (decompressed twice)'] = famwise(`"${gz}"`, `${out}.gz-file`);
    commands['zcat | famwise (decompressed once, spilled)'] = `zcat "${gz}" | ${famwise('', `${out}.gz-pipe`)}`;
  }
  if (args.reference) commands['R data.table reference'] = `Rscript "${shared}r-pipeline.R" "${path}" "${out}.r"`;
  const results = Object.fromEntries(Object.keys(commands).map((name) => [name, []]));
  for (let run = 0; run < runs; run++) {
    for (const [name, command] of Object.entries(commands)) results[name].push(timed(command));
  }
  console.log(`\n${rows.toLocaleString('en')} rows, ${megabytes.toFixed(0)} MB, median of ${runs} alternating runs, load average now ${loadavg()[0].toFixed(2)}`);
  for (const [name, measured] of Object.entries(results)) {
    const seconds = median(measured.map((m) => m.seconds));
    const cpu = median(measured.map((m) => m.cpu));
    const rss = Math.max(...measured.map((m) => m.rssMb));
    const all = measured.map((m) => m.seconds.toFixed(2)).join(' ');
    console.log(
      `  ${name.padEnd(46)} ${seconds.toFixed(2).padStart(7)} s  (${all})  CPU ${cpu.toFixed(2)} s  ${(rows / seconds / 1e6).toFixed(2)} M rows/s  ${(megabytes / seconds).toFixed(0)} MB/s  peak RSS ${rss.toFixed(0)} MB`,
    );
  }
  const fileOut = digest(`${out}.file`);
  console.log(`  output from the file, from stdin and from a pipe identical: ${fileOut === digest(`${out}.stdin`) && fileOut === digest(`${out}.pipe`)}`);
  if (args.reference) {
    const ratios = (of) => {
      const reference = median(results['R data.table reference'].map(of));
      const ratio = (name) => (median(results[name].map(of)) / reference).toFixed(2);
      return `${ratio('famwise, file')} (file), ${ratio('famwise, stdin from the file')} (stdin from the file), ${ratio('famwise, stdin from a pipe')} (pipe)`;
    };
    console.log(`  ratio famwise / reference, wall time: ${ratios((m) => m.seconds)}`);
    // Each round's famwise run against the reference run of the same round, seconds apart: the
    // median of these ratios leaves out most of the machine's drift from one minute to the next.
    const perRound = (name) => {
      const reference = results['R data.table reference'];
      return median(results[name].map((m, run) => m.seconds / reference[run].seconds)).toFixed(2);
    };
    console.log(`  median of the rounds' own ratios, wall: ${perRound('famwise, file')} (file), ${perRound('famwise, stdin from the file')} (stdin from the file), ${perRound('famwise, stdin from a pipe')} (pipe)`);
    // Steadier on a shared machine than wall time (not what the targets are set in).
    console.log(`  ratio famwise / reference, CPU time:  ${ratios((m) => m.cpu)}`);
  }
}
