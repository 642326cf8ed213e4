// Running a large table's command in a child Node process started with
// --no-concurrent-recompilation (src/cli/relaunch.ts): when it is done, what
// the child gets, and that the child's exit status, signals and output are
// the command's. The CLI runs compare the child's work with this process's
// byte for byte.
import { spawn, spawnSync } from 'node:child_process';
import { closeSync, existsSync, openSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { afterAll, describe, expect, it } from 'vitest';
import { childEnvironment, relaunchWanted, runInChild, withHugePages } from '../dist/cli/relaunch.js';
import { CLI } from './helpers/cli.js';
import { removeTemporaryFolders, temporaryFolder } from './helpers/temporary-folder.js';

const work = temporaryFolder('famwise-relaunch-');
afterAll(removeTemporaryFolders);

const big = join(work, 'big.csv');
const small = join(work, 'small.csv');
writeFileSync(big, 'p\n'.padEnd(4000, '0'));
writeFileSync(small, 'p\n0.5\n');

const noStdin = (): undefined => undefined;
/** Two cores, no Node options, sizes set small: the child is wanted for big.csv. */
const base = { env: { FAMWISE_RELAUNCH_MIN_BYTES: '1000', FAMWISE_PARALLEL_MIN_BYTES: '1000' }, execArgv: [], cores: 2, stdinStat: noStdin };

describe('relaunchWanted', () => {
  it('is true for adjust of a large file on two cores or fewer', () => {
    expect(relaunchWanted(['adjust', big, '--methods', 'bh,holm'], base)).toBe(true);
    expect(relaunchWanted(['adjust', '-q', big], { ...base, cores: 1 })).toBe(true);
    expect(relaunchWanted(['adjust', '-q'], { ...base, stdinStat: () => statSync(big) })).toBe(true);
  });

  it('is false in the child, with Node options of its own, on more cores, for a small file, other commands or a large output', () => {
    expect(relaunchWanted(['adjust', big], { ...base, env: { ...base.env, FAMWISE_RELAUNCHED: '1' } })).toBe(false);
    expect(relaunchWanted(['adjust', big], { ...base, execArgv: ['--inspect'] })).toBe(false);
    expect(relaunchWanted(['adjust', big], { ...base, env: { ...base.env, NODE_OPTIONS: '--max-old-space-size=4096 --inspect-brk' } })).toBe(false);
    expect(relaunchWanted(['adjust', big], { ...base, env: { ...base.env, NODE_OPTIONS: '--max-old-space-size=4096' } })).toBe(true);
    expect(relaunchWanted(['adjust', big], { ...base, cores: 4 })).toBe(false);
    expect(relaunchWanted(['adjust', small], base)).toBe(false);
    expect(relaunchWanted(['audit', big, '--adjusted-column', 'q'], base)).toBe(false);
    // inspect reads in two threads, but gained nothing from the child.
    expect(relaunchWanted(['inspect', big], base)).toBe(false);
    expect(relaunchWanted(['adjust', small, '-o', big], base)).toBe(false);
    expect(relaunchWanted(['adjust'], { ...base, stdinStat: () => statSync(work) })).toBe(false);
  });

  it('is false for a gzip file (read in one thread), recognised by its content', () => {
    const gz = join(work, 'big.csv.gz');
    writeFileSync(gz, Buffer.concat([Buffer.from([0x1f, 0x8b]), Buffer.alloc(4000, 1)]));
    expect(relaunchWanted(['adjust', gz], base)).toBe(false);
    const named = join(work, 'plain.gz');
    writeFileSync(named, 'p\n'.padEnd(4000, '0'));
    expect(relaunchWanted(['adjust', named], base)).toBe(true);
  });

  it('takes the larger of its own size and the size read in two parts', () => {
    expect(relaunchWanted(['adjust', big], { ...base, env: { ...base.env, FAMWISE_RELAUNCH_MIN_BYTES: '5000' } })).toBe(false);
    expect(relaunchWanted(['adjust', big], { ...base, env: { ...base.env, FAMWISE_PARALLEL_MIN_BYTES: '5000' } })).toBe(false);
    // The default: 32 MiB.
    expect(relaunchWanted(['adjust', big], { ...base, env: { FAMWISE_PARALLEL_MIN_BYTES: '0' } })).toBe(false);
  });
});

describe('childEnvironment', () => {
  it('marks the child, drops the certificates file famwise never uses, asks for huge pages, and keeps everything else', () => {
    const env = childEnvironment({ PATH: '/bin', NODE_EXTRA_CA_CERTS: '/etc/certs.pem', LC_ALL: 'C' });
    expect(env).toEqual({ PATH: '/bin', LC_ALL: 'C', FAMWISE_RELAUNCHED: '1', GLIBC_TUNABLES: 'glibc.malloc.hugetlb=1' });
  });

  it('adds huge pages to the caller\'s own glibc settings, and leaves a choice of them alone', () => {
    expect(withHugePages(undefined)).toBe('glibc.malloc.hugetlb=1');
    expect(withHugePages('')).toBe('glibc.malloc.hugetlb=1');
    expect(withHugePages('glibc.malloc.arena_max=2')).toBe('glibc.malloc.arena_max=2:glibc.malloc.hugetlb=1');
    expect(withHugePages('glibc.malloc.hugetlb=0')).toBe('glibc.malloc.hugetlb=0');
    expect(withHugePages('glibc.malloc.arena_max=2:glibc.malloc.hugetlb=2')).toBe('glibc.malloc.arena_max=2:glibc.malloc.hugetlb=2');
    expect(childEnvironment({ GLIBC_TUNABLES: 'glibc.malloc.hugetlb=0' }).GLIBC_TUNABLES).toBe('glibc.malloc.hugetlb=0');
  });
});

describe('runInChild', () => {
  const probe = join(work, 'probe.mjs');
  writeFileSync(
    probe,
    [
      `import { watchParent } from ${JSON.stringify(new URL('../dist/cli/relaunch.js', import.meta.url).href)};`,
      "import { writeFileSync } from 'node:fs';",
      'watchParent();',
      "const [mode] = process.argv.slice(2);",
      "console.log(JSON.stringify({ execArgv: process.execArgv, certs: process.env.NODE_EXTRA_CA_CERTS ?? null, child: process.env.FAMWISE_RELAUNCHED, tunables: process.env.GLIBC_TUNABLES }));",
      "if (mode === 'status') process.exit(3);",
      "if (mode === 'killed') process.kill(process.pid, 'SIGKILL');",
      `if (mode === 'wait') { process.on('SIGTERM', () => { writeFileSync(${JSON.stringify(join(work, 'stopped'))}, 'yes'); console.log('child got SIGTERM'); process.exit(143); }); console.log('ready'); setTimeout(() => {}, 20000); }`,
    ].join('\n'),
  );
  // A parent as famwise.mjs is one: it runs the probe in a child and ends with its status.
  const parent = join(work, 'parent.mjs');
  writeFileSync(
    parent,
    `import { runInChild } from ${JSON.stringify(new URL('../dist/cli/relaunch.js', import.meta.url).href)};\n` +
      `const ran = await runInChild(${JSON.stringify(probe)}, process.argv.slice(2), { ...process.env, NODE_EXTRA_CA_CERTS: '/etc/certs.pem' });\n` +
      "if (!ran) console.log('no child');\n",
  );

  it('starts the child with the flag, marked, without the certificates file, and takes its exit status', () => {
    const result = spawnSync(process.execPath, [parent, 'status'], { encoding: 'utf8' });
    expect(JSON.parse(result.stdout.split('\n')[0] as string)).toEqual({ execArgv: ['--no-concurrent-recompilation'], certs: null, child: '1', tunables: 'glibc.malloc.hugetlb=1' });
    expect(result.status).toBe(3);
  });

  it('ends with 128 + the signal when the child is killed', () => {
    const result = spawnSync(process.execPath, [parent, 'killed'], { encoding: 'utf8' });
    expect(result.status).toBe(128 + 9);
  });

  it('passes a signal on to the child, and ends as the child does', async () => {
    const running = spawn(process.execPath, [parent, 'wait'], { stdio: ['ignore', 'pipe', 'inherit'] });
    let out = '';
    const ended = new Promise<number | null>((resolve) => running.on('exit', (code) => resolve(code)));
    await new Promise<void>((resolve) =>
      running.stdout.on('data', (chunk: Buffer) => {
        out += chunk.toString();
        if (out.includes('ready')) resolve();
      }),
    );
    running.kill('SIGTERM');
    expect(await ended).toBe(143);
    expect(out).toContain('child got SIGTERM');
  });

  it('stops the child as on SIGTERM when this process is killed (SIGKILL cannot be passed on)', async () => {
    rmSync(join(work, 'stopped'), { force: true });
    const running = spawn(process.execPath, [parent, 'wait'], { stdio: ['ignore', 'pipe', 'inherit'] });
    let out = '';
    await new Promise<void>((resolve) =>
      running.stdout.on('data', (chunk: Buffer) => {
        out += chunk.toString();
        if (out.includes('ready')) resolve();
      }),
    );
    running.kill('SIGKILL');
    for (let waited = 0; waited < 5000 && !existsSync(join(work, 'stopped')); waited += 50) await new Promise((resolve) => setTimeout(resolve, 50));
    expect(existsSync(join(work, 'stopped'))).toBe(true);
  });

  it('resolves false, doing nothing, when the child cannot be started at all (thrown at once: an environment too large)', async () => {
    expect(await runInChild(probe, [], { HUGE: 'x'.repeat(200_000) })).toBe(false);
    expect(process.exitCode ?? 0).toBe(0);
  });

  it('resolves false, doing nothing, when no child can be started', async () => {
    const saved = process.execPath;
    Object.defineProperty(process, 'execPath', { value: join(work, 'no-such-node'), configurable: true });
    try {
      expect(await runInChild(probe, [], {})).toBe(false);
    } finally {
      Object.defineProperty(process, 'execPath', { value: saved, configurable: true });
    }
    expect(process.exitCode ?? 0).toBe(0);
  });
});

describe('the command run in a child', () => {
  const table = join(work, 'table.csv');
  const rows = Array.from({ length: 3000 }, (_, i) => `g${i},${(((i * 7919) % 3001) / 3001).toFixed(6)}\n`);
  writeFileSync(table, `gene,p\n${rows.join('')}`);
  // Each start of node appends its options here (loaded through NODE_OPTIONS, so it runs in the child too; not in worker threads).
  const log = join(work, 'starts.log');
  const preload = join(work, 'preload.cjs');
  writeFileSync(preload, `if (require('node:worker_threads').isMainThread) require('node:fs').appendFileSync(${JSON.stringify(log)}, JSON.stringify(process.execArgv) + '\\n');\n`);

  function run(args: string[], relaunch: boolean, options: { input?: Buffer | string; stdin?: number } = {}): { status: number | null; stdout: Buffer; stderr: string; starts: string[][] } {
    writeFileSync(log, '');
    const env = { ...process.env, FAMWISE_PARALLEL_MIN_BYTES: '0', FAMWISE_RELAUNCH_MIN_BYTES: relaunch ? '0' : String(Number.MAX_SAFE_INTEGER), NODE_OPTIONS: `--require=${preload}` };
    const result = spawnSync(process.execPath, [CLI, ...args], { cwd: work, env, input: options.input, stdio: [options.stdin ?? 'pipe', 'pipe', 'pipe'], maxBuffer: 1 << 26 });
    const starts = readFileSync(log, 'utf8').trim().split('\n').filter(Boolean).map((line) => JSON.parse(line) as string[]);
    return { status: result.status, stdout: result.stdout, stderr: result.stderr.toString(), starts };
  }

  // On more than two cores famwise keeps to one process; the command's output is the same either way.
  const relaunches = availableParallelism() <= 2;

  it('runs in a child started with the flag (on two cores or fewer), with the same bytes, messages and status', () => {
    for (const args of [['adjust', 'table.csv', '--methods', 'bh,holm'], ['adjust', 'table.csv', '--methods', 'bh', '-o', 'out.csv', '--summary', '-'], ['adjust', 'table.csv', '--format', 'jsonl', '--family', 'gene']]) {
      const child = run(args, true);
      const here = run(args, false);
      expect(child.starts.length).toBe(relaunches ? 2 : 1);
      if (relaunches) expect(child.starts[1]).toEqual(['--no-concurrent-recompilation']);
      expect(here.starts).toEqual([[]]);
      expect(child.status).toBe(0);
      expect(child.status).toBe(here.status);
      expect(child.stderr).toBe(here.stderr);
      expect(child.stdout.equals(here.stdout)).toBe(true);
    }
  });

  it('reads standard input redirected from the file in the child', () => {
    const fd = openSync(table, 'r');
    try {
      const child = run(['adjust', '--methods', 'holm'], true, { stdin: fd });
      expect(child.starts.length).toBe(relaunches ? 2 : 1);
      expect(child.status).toBe(0);
      expect(child.stdout.equals(run(['adjust', 'table.csv', '--methods', 'holm'], false).stdout)).toBe(true);
    } finally {
      closeSync(fd);
    }
  });

  it('keeps gzip input in one process, from a file or from standard input', () => {
    writeFileSync(join(work, 'table.csv.gz'), gzipSync(readFileSync(table)));
    const fd = openSync(join(work, 'table.csv.gz'), 'r');
    try {
      for (const [args, stdin] of [[['adjust', 'table.csv.gz'], undefined], [['adjust'], fd]] as const) {
        const result = run([...args, '--methods', 'holm'], true, stdin === undefined ? {} : { stdin });
        expect(result.status).toBe(0);
        expect(result.starts).toEqual([[]]);
        expect(result.stdout.equals(run(['adjust', 'table.csv', '--methods', 'holm'], false).stdout)).toBe(true);
      }
    } finally {
      closeSync(fd);
    }
  });

  it('gives a bad cell and a bad option the same message and status as in one process', () => {
    writeFileSync(join(work, 'bad.csv'), `gene,p\n${rows.slice(0, 1500).join('')}gX,2\n${rows.slice(1500).join('')}`);
    for (const args of [['adjust', 'bad.csv', '-o', 'bad-out.csv'], ['adjust', 'table.csv', '--methods', 'nope']]) {
      const child = run(args, true);
      const here = run(args, false);
      expect(child.status).not.toBe(0);
      expect(child.status).toBe(here.status);
      expect(child.stderr).toBe(here.stderr);
    }
    expect(run(['adjust', 'bad.csv'], true).stderr).toContain('bad.csv:1502: column "p": "2"');
  });
});
