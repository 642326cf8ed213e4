// The corpus tables too large to commit (fixtures/hostile-tables/manifest.json
// marks them "generated"): made here, the same bytes every time.

/** A table whose first row holds one quoted field of exactly 10 MiB, with delimiters, quotes and line breaks inside. */
function tenMebibyteField(): Buffer {
  const size = 10 * 1024 * 1024;
  const unit = 'text, with "quotes";\tand\nline breaks\r\n';
  const content = unit.repeat(Math.ceil(size / unit.length)).slice(0, size);
  return Buffer.from(`note,p\n"${content.replaceAll('"', '""')}",0.01\nshort,0.04\n`);
}

/** 10,000 columns: the p-values in column 5000, the family in column 10000. */
function tenThousandColumns(): Buffer {
  const columns = 10_000;
  const pColumn = 4999;
  const row = (cells: (k: number) => string): string => Array.from({ length: columns }, (_, k) => cells(k)).join(',');
  const header = row((k) => (k === pColumn ? 'p' : `c${k + 1}`));
  const data = [['0.01', 'f'], ['0.04', 'f'], ['0.01', 'g']].map(([p, family], r) =>
    row((k) => (k === pColumn ? (p as string) : k === columns - 1 ? (family as string) : `r${r}x${k}`)),
  );
  return Buffer.from(`${[header, ...data].join('\n')}\n`);
}

export const LARGE_TABLES: Readonly<Record<string, () => Buffer>> = {
  'ten-mebibyte-field.csv': tenMebibyteField,
  'ten-thousand-columns.csv': tenThousandColumns,
};
