// famwise adjust end to end, through the built CLI.
import { spawnSync } from 'node:child_process';
import { chmodSync, closeSync, existsSync, lstatSync, mkdtempSync, openSync, readFileSync, readdirSync, statSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { CLI, type Run, famwise } from './helpers/cli.js';
import { removeTemporaryFolders, temporaryFolder } from './helpers/temporary-folder.js';

afterAll(removeTemporaryFolders);

const work = temporaryFolder('famwise-e2e-');
function file(name: string, content: string | Buffer): string {
  const path = join(work, name);
  writeFileSync(path, content);
  return path;
}

describe('pipes and formats', () => {
  it('reads stdin and writes CSV with adj_ and rej_ columns per method, in the order given', () => {
    const run = famwise(['adjust', '--methods', 'holm,bh', '--quiet'], 'id,p_value\na,0.01\nb,0.04\nc,0.03\n');
    expect(run.status).toBe(0);
    expect(run.stderr).toBe('');
    expect(run.stdout).toBe(
      'id,p_value,adj_holm,rej_holm,adj_bh,rej_bh\na,0.01,0.03,true,0.03,true\nb,0.04,0.06,false,0.04,true\nc,0.03,0.06,false,0.04,true\n',
    );
  });

  it('passes every original byte through: quotes, commas and newlines in fields, unicode, CRLF, BOM, blank lines, no final newline', () => {
    const input = '\ufeffgene,"note, quoted",p\r\n"g1","ünï ""q""\r\nsecond line",0.010\r\n\r\nG2,,1E-3\r\nG3,日本,NA\r\nG4," spaced ",0.5';
    const run = famwise(['adjust', '--methods', 'bonferroni', '--quiet'], input);
    expect(run.status).toBe(0);
    const expected =
      '\ufeffgene,"note, quoted",p,adj_bonferroni,rej_bonferroni\r\n"g1","ünï ""q""\r\nsecond line",0.010,0.03,true\r\n\r\nG2,,1E-3,0.003,true\r\nG3,日本,NA,,\r\nG4," spaced ",0.5,1,false';
    expect(run.stdoutBytes.equals(Buffer.from(expected))).toBe(true);
  });

  it('keeps bytes that are not valid UTF-8 in other columns unchanged', () => {
    const input = Buffer.concat([Buffer.from('name,p\n'), Buffer.from([0x63, 0x61, 0x66, 0xe9]), Buffer.from(',0.2\n')]);
    const run = famwise(['adjust', '--quiet'], input);
    expect(run.stdoutBytes.equals(Buffer.concat([Buffer.from('name,p,adj_bh,rej_bh\n'), Buffer.from([0x63, 0x61, 0x66, 0xe9]), Buffer.from(',0.2,0.2,false\n')]))).toBe(true);
  });

  it('writes TSV for TSV input, and converts when --format asks', () => {
    const input = 'id\tp\tnote\nx\t0.02\ta,b\ny\t0.03\t"q"\n';
    expect(famwise(['adjust', '--quiet'], input).stdout).toBe('id\tp\tnote\tadj_bh\trej_bh\nx\t0.02\ta,b\t0.03\ttrue\ny\t0.03\t"q"\t0.03\ttrue\n');
    expect(famwise(['adjust', '--quiet', '--format', 'csv'], input).stdout).toBe('id,p,note,adj_bh,rej_bh\nx,0.02,"a,b",0.03,true\ny,0.03,q,0.03,true\n');
  });

  it('gives the same bytes from a file as from a pipe', () => {
    const input = readFileSync(new URL('../demo-data/enzyme-screen.csv', import.meta.url));
    const path = file('demo.csv', input);
    const args = ['adjust', '--family', 'storage_temp', '--methods', 'bh,by,holm', '--quiet'];
    const fromFile = famwise([...args, path]);
    const fromPipe = famwise(args, input);
    expect(fromFile.status).toBe(0);
    expect(fromFile.stdoutBytes.equals(fromPipe.stdoutBytes)).toBe(true);
    expect(famwise([...args, '-'], input).stdoutBytes.equals(fromPipe.stdoutBytes)).toBe(true);
  });

  it('takes method tokens in any case', () => {
    expect(famwise(['adjust', '--values', '0.01', '--methods', 'BH,Holm', '--quiet']).stdout).toBe('p,adj_bh,rej_bh,adj_holm,rej_holm\n0.01,0.01,true,0.01,true\n');
  });

  it('prints an aligned table with --format table', () => {
    const run = famwise(['adjust', '--values', '0.01,0.04,0.03', '--methods', 'bonferroni', '--format', 'table', '--quiet']);
    expect(run.stdout).toBe('   p  adj_bonferroni  rej_bonferroni\n0.01            0.03  true\n0.04            0.12  false\n0.03            0.09  false\n');
  });

  it('accepts p-values pasted one per line with no header, and says how it read the first line', () => {
    const run = famwise(['adjust', '--methods', 'bonferroni'], '0.01\n0.02\n');
    expect(run.status).toBe(0);
    expect(run.stdout).toBe('0.01,0.02,true\n0.02,0.04,true\n');
    expect(run.stderr).toMatch(/note: the first line holds only numbers, so it is read as data/);
  });

  it('reads decimal commas in tables not separated by commas, and writes the new numbers the same way', () => {
    const run = famwise(['adjust', '--quiet', '--methods', 'bonferroni'], 'id;p\na;0,01\nb;0,2\n');
    expect(run.stdout).toBe('id;p;adj_bonferroni;rej_bonferroni\na;0,01;0,02;true\nb;0,2;0,4;false\n');
    const tab = famwise(['adjust', '--quiet', '--methods', 'bonferroni'], 'id\tp\na\t0,01\nb\t0,2\n');
    expect(tab.stdout).toBe('id\tp\tadj_bonferroni\trej_bonferroni\na\t0,01\t0,02\ttrue\nb\t0,2\t0,4\tfalse\n');
    expect(famwise(['adjust', '--quiet', '--methods', 'bonferroni'], 'id;p\na;0.01\nb;0.2\n').stdout).toBe('id;p;adj_bonferroni;rej_bonferroni\na;0.01;0.02;true\nb;0.2;0.4;false\n');
  });

  it('keeps family values apart that differ only in bytes that are not valid UTF-8', () => {
    const input = Buffer.concat([Buffer.from('site,p\nM'), Buffer.from([0xfc]), Buffer.from('nchen,0.01\nM'), Buffer.from([0xe4]), Buffer.from('nchen,0.02\n')]);
    const run = famwise(['adjust', '--family', 'site', '--methods', 'bonferroni'], input);
    // Two families of one test each: nothing to multiply.
    expect(run.stdoutBytes.toString('latin1')).toBe('site,p,adj_bonferroni,rej_bonferroni\nM\xfcnchen,0.01,0.01,true\nM\xe4nchen,0.02,0.02,true\n');
    expect(run.stderr).toMatch(/site=M\\xfcnchen .*\n.*site=M\\xe4nchen /);
  });

  it('converts between CSV and TSV without touching bytes that are not valid UTF-8, and without decimal commas in CSV', () => {
    const input = Buffer.concat([Buffer.from('name;p\ncaf'), Buffer.from([0xe9]), Buffer.from(';0,01\n"a;b";0,2\n')]);
    const run = famwise(['adjust', '--format', 'csv', '--methods', 'bonferroni', '--quiet'], input);
    expect(run.stdoutBytes.equals(Buffer.concat([Buffer.from('name,p,adj_bonferroni,rej_bonferroni\ncaf'), Buffer.from([0xe9]), Buffer.from(',"0,01",0.02,true\na;b,"0,2",0.4,false\n')]))).toBe(true);
  });

  it('reads a ;-separated export with a byte-order mark and a quoted first column name', () => {
    const run = famwise(['adjust', '--quiet', '--methods', 'bonferroni'], '\ufeff"gene, name";p\nx;0,01\ny;0,02\n');
    expect(run.status).toBe(0);
    expect(run.stdout).toBe('\ufeff"gene, name";p;adj_bonferroni;rej_bonferroni\nx;0,01;0,02;true\ny;0,02;0,04;true\n');
  });

  it('reads a headerless list whose first value is missing', () => {
    const run = famwise(['adjust', '--methods', 'bonferroni', '--quiet'], 'NA\n0.01\n0.02\n');
    expect(run.status).toBe(0);
    expect(run.stdout).toBe('NA,,\n0.01,0.02,true\n0.02,0.04,true\n');
  });

  it('reads a table larger than its 1 MiB reading blocks, with records across block edges', () => {
    const rows: string[] = [];
    for (let i = 0; i < 60_000; i++) rows.push(`"id ${i}\nsecond line, with comma",${(i % 1000) / 1000}`);
    const input = `name,p\n${rows.join('\r\n')}\r\n`;
    const run = famwise(['adjust', '--methods', 'bonferroni', '--tests', '60000', '--quiet'], input);
    expect(run.status).toBe(0);
    const expected = `name,p,adj_bonferroni,rej_bonferroni\n${rows
      .map((row, i) => {
        const adjusted = Math.min(1, 60_000 * ((i % 1000) / 1000));
        return `${row},${adjusted},${adjusted <= 0.05}`;
      })
      .join('\r\n')}\r\n`;
    expect(Buffer.byteLength(input)).toBeGreaterThan(2 << 20);
    expect(run.stdout).toBe(expected);
  });

  it('reads a file that can be read only once (a pipe given as FILE)', () => {
    const run = spawnSync('sh', ['-c', `printf 'p\\n0.01\\n0.02\\n' | "${process.execPath}" "${CLI}" adjust /dev/stdin --quiet --methods bonferroni`], { encoding: 'utf8' });
    expect(run.status).toBe(0);
    expect(run.stdout).toBe('p,adj_bonferroni,rej_bonferroni\n0.01,0.02,true\n0.02,0.04,true\n');
  });

  it('still writes the summary when the reader of standard output stops early', () => {
    const rows = Array.from({ length: 200_000 }, (_, i) => `r${i},${((i * 7919) % 100_000) / 100_000}`).join('\n');
    const path = file('long.csv', `id,p\n${rows}\n`);
    const summary = join(work, 'long-summary.json');
    const run = spawnSync('sh', ['-c', `"${process.execPath}" "${CLI}" adjust "${path}" --summary "${summary}" | head -n 2`], { encoding: 'utf8' });
    expect(run.stdout).toBe('id,p,adj_bh,rej_bh\nr0,0,0,true\n');
    expect(run.stderr).toMatch(/\(all rows\)\s+bh\s+200000/);
    expect(run.stderr).not.toMatch(/EPIPE|\n\s+at /);
    expect(JSON.parse(readFileSync(summary, 'utf8')).rows[0].tested).toBe(200_000);
  });
});

describe('long first records', () => {
  // The delimiter and the line endings are told from the first two records, which can be long.
  const wide = (ending: string, delimiter: string, cells: number): string => {
    let text = `p${`${delimiter}c`.repeat(cells)}${ending}`;
    for (const p of ['0.01', '0.02', '0.5']) text += `${p}${`${delimiter}0`.repeat(cells)}${ending}`;
    return text;
  };
  /** The command run on the file by name, with standard input redirected from it, and through a pipe. */
  const everyWay = (name: string, content: string): Run[] => {
    const path = file(name, content);
    const fd = openSync(path, 'r');
    try {
      const redirected = spawnSync(process.execPath, [CLI, 'adjust', '-q'], { stdio: [fd, 'pipe', 'pipe'] });
      const asRun = { status: redirected.status, stdout: redirected.stdout.toString(), stderr: redirected.stderr.toString(), stdoutBytes: redirected.stdout };
      return [famwise(['adjust', path, '-q']), asRun, famwise(['adjust', '-q'], content)];
    } finally {
      closeSync(fd);
    }
  };

  it('reads a table with classic Mac line endings (a lone CR) whose header is 66 KB, however it is given', () => {
    for (const run of everyWay('cr-wide.csv', wide('\r', ',', 33_000))) {
      expect(run.stderr).toBe('');
      expect(run.status).toBe(0);
      const rows = run.stdout.split('\r').slice(0, 4);
      expect(rows.map((row) => row.split(',').slice(-2).join(' '))).toEqual(['adj_bh rej_bh', '0.03 true', '0.03 true', '0.5 false']);
    }
  });

  it('tells a semicolon delimiter from commas inside long first records, however the table is given', () => {
    const content = `x,y;${wide('\n', ';', 20_000).replace(/\n(?=.)/g, '\nu,v;')}`;
    for (const run of everyWay('semicolons-wide.csv', content)) {
      expect(run.stderr).toBe('');
      expect(run.status).toBe(0);
      expect(run.stdout.split('\n').slice(0, 4).map((row) => row.split(';').slice(-2).join(' '))).toEqual(['adj_bh rej_bh', '0.03 true', '0.03 true', '0.5 false']);
    }
  });
});

describe('families, tests and missing values', () => {
  const table = 'plate,well,p\nA,1,0.01\nB,1,0.02\nA,2,0.03\nB,2,\nA,3,0.04\nB,3,0.001\n';

  it('adjusts each family on its own and reports each in the JSON summary', () => {
    const summary = join(work, 'summary.json');
    const run = famwise(['adjust', '--family', 'plate', '--methods', 'bh,holm', '--summary', summary], table);
    expect(run.status).toBe(0);
    // Family A: 0.01, 0.03, 0.04 -> BH 0.03, 0.04, 0.04. Family B: 0.02, missing, 0.001 -> BH 0.02, -, 0.002.
    expect(run.stdout.split('\n').map((line) => line.split(',').slice(0, 5).join(','))).toEqual([
      'plate,well,p,adj_bh,rej_bh',
      'A,1,0.01,0.03,true',
      'B,1,0.02,0.02,true',
      'A,2,0.03,0.04,true',
      'B,2,,,',
      'A,3,0.04,0.04,true',
      'B,3,0.001,0.002,true',
      '',
    ]);
    expect(JSON.parse(readFileSync(summary, 'utf8'))).toEqual({
      alpha: 0.05,
      rows: [
        { family: { plate: 'A' }, method: 'bh', tested: 3, missing: 0, m: 3, rejected: 3, threshold: 0.04, pi0: null },
        { family: { plate: 'A' }, method: 'holm', tested: 3, missing: 0, m: 3, rejected: 1, threshold: 0.01, pi0: null },
        { family: { plate: 'B' }, method: 'bh', tested: 2, missing: 1, m: 2, rejected: 2, threshold: 0.02, pi0: null },
        { family: { plate: 'B' }, method: 'holm', tested: 2, missing: 1, m: 2, rejected: 2, threshold: 0.02, pi0: null },
      ],
    });
    expect(run.stderr).toMatch(/plate=A\s+bh\s+3\s+0\s+3\s+3\s+0\.04/);
  });

  it('combines several family columns', () => {
    const run = famwise(['adjust', '--family', 'a,b', '--methods', 'bonferroni', '--quiet'], 'a,b,p\nx,1,0.01\nx,2,0.01\nx,1,0.02\n');
    expect(run.stdout).toBe('a,b,p,adj_bonferroni,rej_bonferroni\nx,1,0.01,0.02,true\nx,2,0.01,0.01,true\nx,1,0.02,0.04,true\n');
  });

  it('counts the tests the table does not hold with --tests', () => {
    const run = famwise(['adjust', '--tests', '10', '--methods', 'bonferroni,bh', '--quiet'], 'p\n0.001\n0.004\n');
    expect(run.stdout).toBe('p,adj_bonferroni,rej_bonferroni,adj_bh,rej_bh\n0.001,0.01,true,0.01,true\n0.004,0.04,true,0.02,true\n');
  });

  it('refuses --tests smaller than a family and names the family', () => {
    const run = famwise(['adjust', '--family', 'plate', '--tests', '2'], table);
    expect(run.status).toBe(2);
    expect(run.stderr).toBe('famwise: --tests 2: family plate=A holds 3 p-values; --tests must be at least that\n');
    expect(run.stdout).toBe('');
  });
});

describe('errors name the place and the text, with the right status', () => {
  const cases: [string, string[], string, number, RegExp][] = [
    ['a p-value above 1', ['adjust'], 'id,p\na,0.5\nb,1.5\n', 1, /^famwise: <stdin>:3: column "p": "1\.5" is not a p-value: p-values cannot exceed 1/],
    ['a negative p-value', ['adjust'], 'id,p\na,-0.1\n', 1, /<stdin>:2: column "p": "-0\.1" is not a p-value: p-values cannot be negative/],
    ['text', ['adjust'], 'id,p\na,0.1\nb,abc\n', 1, /<stdin>:3: column "p": "abc" is not a p-value: expected a number from 0 to 1/],
    ['a bound', ['adjust'], 'id,p\na,<2e-16\n', 1, /<stdin>:2: column "p": "<2e-16" is not a p-value: it is a bound/],
    ['a row with too few fields', ['adjust'], 'id,x,p\na,1,0.1\nb,0.2\n', 1, /<stdin>:3: 2 fields where the header has 3/],
    ['an unterminated quote', ['adjust'], 'id,p\n"a,0.1\n', 1, /<stdin>:2: field 1: a quoted field opened here is never closed/],
    ['an empty input', ['adjust'], '', 1, /<stdin>: the input is empty/],
    ['an unknown p column', ['adjust', '--p-column', 'pv'], 'id,p\na,0.1\n', 2, /--p-column "pv": no such column; the columns are "id", "p"/],
    ['no p column', ['adjust'], 'id,score\na,0.1\n', 2, /no column is named like a p-value column.*--p-column/],
    ['two p columns', ['adjust'], 'pval,p_value\n0.1,0.2\n', 2, /several columns could hold the raw p-values: "pval" \(column 1\), "p_value" \(column 2\)/],
    ['a p column in another case', ['adjust', '--p-column', 'pval'], 'id,PVAL\na,0.1\n', 2, /--p-column "pval": no such column; did you mean "PVAL"\?/],
    ['a first line of data', ['adjust'], 'a\t0.01\n', 2, /the first line looks like data: if the table has no header, use --no-header with --p-column N/],
    ['p-values on one line', ['adjust'], '0.01 0.04 0.03\n', 2, /p-values go one per line, or use --values/],
    ['R row names', ['adjust'], 'fc\tpvalue\nG1\t1\t0.01\n', 1, /<stdin>:2: 3 fields where the header has 2 \(is the first column row names\?/],
    ['a line of spaces', ['adjust'], 'id,p\na,0.1\n   \n', 1, /<stdin>:3: 1 field where the header has 2 \(a line holding only spaces\?\)/],
    ['a family column named twice', ['adjust', '--family', 'g,1'], 'g,p\nx,0.1\n', 2, /--family: column 1 is named twice/],
    ['two family columns of one name', ['adjust', '--family', '1,2'], 'g,g,p\nx,y,0.1\n', 2, /--family: columns 1 and 2 are both named "g"/],
    ['an empty --values', ['adjust', '--values', ''], '', 2, /--values: needs at least one p-value/],
    ['a summary over the input', ['adjust', 'in.csv', '--summary', 'in.csv'], '', 2, /--summary in\.csv: is the input table/],
    ['a summary on standard output with the table', ['adjust', '--summary', '-'], 'p\n0.1\n', 2, /--summary -: standard output carries the table/],
    ['an output that names a folder', ['adjust', '-o', 'somewhere/'], 'p\n0.1\n', 2, /--output somewhere\/: names a folder/],
    ['no command', [], '', 2, /Usage: famwise/],
    ['an absurd --tests', ['adjust', '--tests', '9'.repeat(400)], 'p\n0.1\n', 2, /--tests .*needs a whole number from 1 to 9007199254740991/],
    ['a file name too long', ['adjust', '-o', `${'a'.repeat(260)}.csv`], 'p\n0.1\n', 2, /--output: the file name is longer than 255 bytes/],
    ['an unknown family column', ['adjust', '--family', 'plate'], 'id,p\na,0.1\n', 2, /--family "plate": no such column/],
    ['an unknown method', ['adjust', '--methods', 'bh,fdr'], 'p\n0.1\n', 2, /--methods: unknown method "fdr"; did you mean bh\? the methods are bonferroni, holm, sidak, holm-sidak, hochberg, hommel, bh, by/],
    ['alpha out of range', ['adjust', '--alpha', '1'], 'p\n0.1\n', 2, /--alpha "1": needs a level between 0 and 1/],
    ['alpha not a number', ['adjust', '--alpha', '5%'], 'p\n0.1\n', 2, /--alpha "5%"/],
    ['tests not a number', ['adjust', '--tests', 'many'], 'p\n0.1\n', 2, /--tests "many": needs a whole number/],
    ['an unknown option', ['adjust', '--colour'], 'p\n0.1\n', 2, /famwise: unknown option '--colour'/],
    ['a missing file', ['adjust', 'no-such-file.csv'], '', 2, /famwise: no-such-file\.csv: no such file/],
    ['an existing output column', ['adjust'], 'p,adj_bh\n0.1,0.1\n', 2, /the table already has a column "adj_bh"; use --replace/],
    ['a headerless table of several columns', ['adjust', '--no-header'], 'a,0.1\n', 2, /no header and 2 columns.*--p-column N/],
    ['a bad delimiter', ['adjust', '--delimiter', 'x'], 'p\n0.1\n', 2, /--delimiter "x": accepts comma, tab, semicolon or pipe/],
    ['the same file for output and summary', ['adjust', '-o', 'x.csv', '--summary', 'x.csv'], 'p\n0.1\n', 2, /--summary x\.csv: is also the --output file/],
    ['values and a file', ['adjust', 'x.csv', '--values', '0.1'], '', 2, /--values takes one comma-separated list \(0\.01,0\.04,\.\.\.\); "x\.csv" was read as a table/],
  ];
  for (const [name, args, input, status, message] of cases) {
    it(name, () => {
      const run = famwise(args, input, work);
      expect(run.status).toBe(status);
      expect(run.stderr).toMatch(message);
      expect(run.stderr).not.toMatch(/\n\s+at /); // no stack trace
      expect(run.stdout).toBe('');
    });
  }

  it('names the encodings it does not read, and gzip data cut short', () => {
    const gzip = famwise(['adjust'], Buffer.from([0x1f, 0x8b, 8, 0, 0, 0]));
    expect(gzip.status).toBe(1);
    expect(gzip.stderr).toMatch(/^famwise: <stdin>: the gzip data is damaged or cut short \(unexpected end of file\); check the file with gzip -t\n$/);
    expect(gzip.stdout).toBe('');
    const utf16 = famwise(['adjust'], Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('p\n0.1\n', 'utf16le')]));
    expect(utf16.status).toBe(1);
    expect(utf16.stderr).toMatch(/<stdin>: the file is UTF-16 text .* convert it to UTF-8 first/);
  });

  it('does not create -o FILE when the data are bad, and leaves no temporary file', () => {
    const folder = mkdtempSync(join(work, 'out-'));
    const output = join(folder, 'adjusted.csv');
    const run = famwise(['adjust', '-o', output], 'id,p\na,0.1\nb,2\n');
    expect(run.status).toBe(1);
    expect(existsSync(output)).toBe(false);
    expect(readdirSync(folder)).toEqual([]);
  });

  it('leaves an existing -o FILE untouched when the data are bad', () => {
    const output = file('keep.csv', 'precious\n');
    expect(famwise(['adjust', '-o', output], 'id,p\na,x\n').status).toBe(1);
    expect(readFileSync(output, 'utf8')).toBe('precious\n');
  });

  it('refuses an output folder that does not exist before reading anything', () => {
    const run = famwise(['adjust', '-o', join(work, 'nowhere', 'x.csv')], 'p\n0.1\n');
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(/--output .*the folder .*nowhere does not exist/);
  });

  it('writes through a symbolic link to its file, keeping the file\'s permissions', () => {
    const real = file('real.csv', 'old\n');
    chmodSync(real, 0o640);
    const link = join(work, 'link.csv');
    symlinkSync(real, link);
    expect(famwise(['adjust', '-o', link, '--quiet', '--values', '0.2']).status).toBe(0);
    expect(lstatSync(link).isSymbolicLink()).toBe(true);
    expect(readFileSync(real, 'utf8')).toBe('p,adj_bh,rej_bh\n0.2,0.2,false\n');
    expect(statSync(real).mode & 0o777).toBe(0o640);
  });

  it('appends to what /dev/stdout stands for, rather than replacing it', () => {
    const log = file('log.txt', 'earlier\n');
    const run = spawnSync('sh', ['-c', `"${process.execPath}" "${CLI}" adjust --values 0.2 -o /dev/stdout --quiet >> "${log}"`], { encoding: 'utf8' });
    expect(run.status).toBe(0);
    expect(readFileSync(log, 'utf8')).toBe('earlier\np,adj_bh,rej_bh\n0.2,0.2,false\n');
  });

  it('writes to /dev/stdout and /dev/null as any user, not only as root', () => {
    // As root (as CI runs) the folder /dev is writable, which hid a bug: run as
    // nobody then, if nobody can read the build (a clone under /root cannot be).
    const nobody = { uid: 65534, gid: 65534 };
    const nobodyCanRun =
      process.getuid?.() === 0 && spawnSync(process.execPath, ['-e', `require('fs').accessSync(${JSON.stringify(CLI)})`], { cwd: tmpdir(), ...nobody }).status === 0;
    const asNobody = nobodyCanRun ? nobody : {};
    for (const target of ['/dev/stdout', '/dev/null']) {
      const run = spawnSync(process.execPath, [CLI, 'adjust', '--values', '0.2', '--quiet', '-o', target], { encoding: 'utf8', cwd: tmpdir(), ...asNobody });
      expect(run.stderr).toBe('');
      expect(run.status).toBe(0);
      expect(run.stdout).toBe(target === '/dev/stdout' ? 'p,adj_bh,rej_bh\n0.2,0.2,false\n' : '');
    }
  });

  it('replaces a regular file under /dev/shm rather than appending to it', () => {
    const target = `/dev/shm/famwise-e2e-${process.pid}.csv`;
    writeFileSync(target, 'old\n');
    famwise(['adjust', '--values', '0.2', '--quiet', '-o', target]);
    famwise(['adjust', '--values', '0.2', '--quiet', '-o', target]);
    expect(readFileSync(target, 'utf8')).toBe('p,adj_bh,rej_bh\n0.2,0.2,false\n');
  });

  it('refuses an empty output, summary or plot name, saying what it needs', () => {
    for (const flag of ['-o', '--summary', '--plot']) {
      const run = famwise(['adjust', '--values', '0.2', flag, '']);
      expect(run.status).toBe(2);
      expect(run.stderr).toBe(`famwise: ${flag === '-o' ? '--output' : flag} "": needs a file name, or - for standard output\n`);
    }
  });

  it('treats -o /dev/stdout as standard output, so the summary cannot go there too', () => {
    const run = famwise(['adjust', '--values', '0.2', '-o', '/dev/stdout', '--summary', '-']);
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(/--summary -: standard output carries the table/);
  });

  it('reports a full disk cleanly', () => {
    const run = famwise(['adjust', '--values', '0.2', '-o', '/dev/full']);
    expect(run.status).toBe(1);
    expect(run.stderr).toMatch(/^famwise: ENOSPC/);
    expect(run.stderr).not.toMatch(/\n\s+at /);
  });

  it('takes - as standard output for -o, and for --summary when the table goes to a file', () => {
    expect(famwise(['adjust', '-o', '-', '--quiet', '--values', '0.2']).stdout).toBe('p,adj_bh,rej_bh\n0.2,0.2,false\n');
    const output = join(work, 'with-summary.csv');
    const run = famwise(['adjust', '-o', output, '--summary', '-', '--quiet', '--values', '0.2']);
    expect(JSON.parse(run.stdout).rows[0]).toMatchObject({ family: null, method: 'bh', tested: 1 });
    expect(existsSync(join(work, '-'))).toBe(false);
  });

  it('counts empty --values items as missing, and says when there is nothing to adjust', () => {
    const run = famwise(['adjust', '--values', '0.01,,0.02', '--methods', 'bonferroni']);
    expect(run.stdout).toBe('p,adj_bonferroni,rej_bonferroni\n0.01,0.02,true\nNA,,\n0.02,0.04,true\n');
    expect(run.stderr).toMatch(/\(all rows\)\s+bonferroni\s+2\s+1\s+2/);
    expect(famwise(['adjust'], 'id,p\na,NA\n').stderr).toMatch(/note: the table holds no p-values to adjust/);
  });

  it('refuses a bound among --values as a usage error naming --bounds-as-values, and reads it with that option', () => {
    const refused = famwise(['adjust', '--values', '<0.001,0.2']);
    expect(refused.status).toBe(2);
    expect(refused.stderr).toBe('famwise: --values: item 1, "<0.001", is not a p-value (a number from 0 to 1, or NA); to read an upper bound as its value, add --bounds-as-values\n');
    expect(famwise(['adjust', '--values', 'x,0.2']).stderr).toBe('famwise: --values: item 1, "x", is not a p-value (a number from 0 to 1, or NA)\n');
    const read = famwise(['adjust', '--values', '<0.001,0.2', '--bounds-as-values', '--methods', 'bonferroni']);
    expect(read.status).toBe(0);
    expect(read.stdout).toBe('p,adj_bonferroni,rej_bonferroni\n<0.001,0.002,true\n0.2,0.4,false\n');
    expect(read.stderr).toMatch(/note: --values:2: column "p": "<0.001" is an upper bound, read as its value/);
  });

  it('writes -o FILE and the summary when all is well', () => {
    const output = join(work, 'ok.csv');
    const run = famwise(['adjust', '-o', output, '--quiet'], 'p\n0.2\n');
    expect(run.status).toBe(0);
    expect(run.stdout).toBe('');
    expect(readFileSync(output, 'utf8')).toBe('p,adj_bh,rej_bh\n0.2,0.2,false\n');
  });
});

describe('replacing, headers and help', () => {
  it('overwrites existing adj_/rej_ columns in place with --replace', () => {
    const run = famwise(['adjust', '--replace', '--quiet', '--methods', 'bonferroni'], 'p,adj_bonferroni,note\n0.01,9,x\n0.02,9,y\n');
    expect(run.stdout).toBe('p,adj_bonferroni,note,rej_bonferroni\n0.01,0.02,x,true\n0.02,0.04,y,true\n');
  });

  it('takes --p-column by position without a header', () => {
    const run = famwise(['adjust', '--no-header', '--p-column', '2', '--quiet', '--methods', 'bonferroni'], 'a,0.01\nb,0.02\n');
    expect(run.stdout).toBe('a,0.01,0.02,true\nb,0.02,0.04,true\n');
  });

  it('prints the version and help with exit status 0', () => {
    const version = JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')).version as string;
    expect(famwise(['--version']).stdout.trim()).toBe(version);
    const help = famwise(['adjust', '--help']);
    expect(help.status).toBe(0);
    expect(help.stdout).toMatch(/Exit status:\n0 {2}success\n1 {2}invalid data/);
    expect(help.stdout).toMatch(/qualified statistician/);
  });
});
