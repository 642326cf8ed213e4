// Output fit for pipelines and CI: JSON lines, deterministic bytes, no
// colour codes, results on stdout and messages on stderr.
import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { CLI, expectRefusal, famwise } from './helpers/cli.js';

describe('--format jsonl', () => {
  it('writes one object per row: the fields as strings, the new cells as numbers and booleans', () => {
    const run = famwise(['adjust', '--format', 'jsonl', '--methods', 'bh,holm', '-q'], 'gene,p,note\nA,0.01,"x, ""y"""\nB,NA,\n\nC,0.04,ü\n');
    expect(run.status).toBe(0);
    const lines = run.stdout.trimEnd().split('\n');
    expect(lines).toHaveLength(3);
    expect(JSON.parse(lines[0] as string)).toEqual({ gene: 'A', p: '0.01', note: 'x, "y"', adj_bh: 0.02, rej_bh: true, adj_holm: 0.02, rej_holm: true });
    expect(JSON.parse(lines[1] as string)).toEqual({ gene: 'B', p: 'NA', note: '', adj_bh: null, rej_bh: null, adj_holm: null, rej_holm: null });
    expect(JSON.parse(lines[2] as string)).toMatchObject({ note: 'ü', adj_bh: 0.04 });
  });

  it('keys a table without a header by position, and writes decimal points for decimal-comma input', () => {
    expect(famwise(['adjust', '--no-header', '--format', 'jsonl', '-q'], '0.01\n0.02\n').stdout).toBe('{"1":"0.01","adj_bh":0.02,"rej_bh":true}\n{"1":"0.02","adj_bh":0.02,"rej_bh":true}\n');
    expect(JSON.parse(famwise(['adjust', '--format', 'jsonl', '-q'], 'p;x\n0,01;a\n').stdout)).toEqual({ p: '0,01', x: 'a', adj_bh: 0.01, rej_bh: true });
  });

  it('refuses a header with repeated names, which JSON objects cannot hold', () => {
    expectRefusal(['adjust', '--p-column', '1', '--format', 'jsonl'], 'p,p\n0.01,0.2\n', 2, /--format jsonl: the table has more than one column named "p"/);
  });
});

describe('deterministic, plain output', () => {
  const table = 'family,p\na,0.01\nb,0.2\na,0.03\nb,0.001\n';
  const commands = [
    ['adjust', '--family', 'family', '--methods', 'bh,storey,hommel', '--summary', '/dev/stderr'],
    ['adjust', '--format', 'jsonl'],
    ['methods'],
    ['methods', '--json'],
    ['audit', '--adjusted-column', 'p'],
  ];

  it('gives the same bytes on stdout and stderr every run, whatever the locale and time zone', () => {
    for (const args of commands) {
      const runs = [
        { LANG: 'C', TZ: 'UTC' },
        { LANG: 'de_DE.UTF-8', LC_ALL: 'de_DE.UTF-8', TZ: 'Asia/Tokyo' },
      ].map((env) => spawnSync(process.execPath, [CLI, ...args], { input: table, env: { ...process.env, ...env } }));
      expect(runs[1]?.stdout.equals(runs[0]?.stdout as Buffer)).toBe(true);
      expect(runs[1]?.stderr.equals(runs[0]?.stderr as Buffer)).toBe(true);
    }
  });

  it('never writes colour or other escape codes, with or without NO_COLOR', () => {
    for (const args of commands) {
      for (const env of [{ NO_COLOR: '1' }, { FORCE_COLOR: '3' }]) {
        const run = spawnSync(process.execPath, [CLI, ...args], { input: table, env: { ...process.env, ...env } });
        expect(run.stdout.includes(0x1b)).toBe(false);
        expect(run.stderr.includes(0x1b)).toBe(false);
      }
    }
  });

  it('prints the version for CI logs', () => {
    const run = famwise(['--version']);
    expect(run.status).toBe(0);
    expect(run.stdout).toMatch(/^\d+\.\d+\.\d+\n$/);
  });

  it('lists exit status 3 in the help of audit', () => {
    expect(famwise(['audit', '--help']).stdout).toMatch(/3 {2}the claimed adjusted values do not match/);
  });
});
