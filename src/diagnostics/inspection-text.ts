// The inspection of each family as text for the terminal: counts, the share
// below 0.05, pi0, the inflation factor, the uniformity test, the histogram
// and the findings, each finding with its identifier and wrapped to the width.
//
// Cost: O(bins) per family.

import { terminalHistogram } from '../plots/terminal-histogram.js';
import type { FamilyInspection } from './inspect-family.js';
import { CHI_SQUARE_ONE_MEDIAN } from './inflation.js';
import { shortNumber } from './short-number.js';

/** Words wrapped to `width` columns: the first line starts with `first`, later ones with `indent`. */
export function wrap(text: string, width: number, first: string, indent: string): string[] {
  const lines: string[] = [];
  let line = first;
  for (const word of text.split(' ')) {
    if (line.trim() !== '' && line.length + 1 + word.length > width) {
      lines.push(line);
      line = indent + word;
    } else line = line.trim() === '' ? line + word : `${line} ${word}`;
  }
  lines.push(line);
  return lines;
}

export function inspectionText(label: string, inspection: FamilyInspection, width = 80): string {
  const { counts, shareBelow05, pi0, inflation, uniformity, histogram, findings } = inspection;
  const lines = [label];
  lines.push(
    `  p-values: ${counts.tested} (missing ${counts.missing}); exactly 0: ${counts.zeros}; exactly 1: ${counts.ones}; distinct: ${counts.distinct}`,
  );
  if (shareBelow05 === null) return `${[...lines, '  nothing to inspect'].join('\n')}\n`;
  lines.push(`  below 0.05: ${shortNumber(100 * shareBelow05)}% (${counts.below05}); null p-values alone would give 5%`);
  if (pi0 !== null) lines.push(`  share of true nulls, pi0 (Storey, from the p-values above 0.5): ${shortNumber(pi0)}`);
  if (inflation?.lambda === Infinity) lines.push('  inflation factor lambda: unbounded (half or more of the p-values are exactly 0)');
  else if (inflation) {
    lines.push(`  inflation factor lambda: ${shortNumber(inflation.lambda)} (median chi-square(1) statistic ${shortNumber(inflation.medianStatistic)}; null tests give ${shortNumber(CHI_SQUARE_ONE_MEDIAN)})`);
  }
  lines.push(
    uniformity
      ? `  upper half flat? Kolmogorov-Smirnov test of the ${uniformity.n} p-values above 0.5: D = ${shortNumber(uniformity.statistic)}, p = ${shortNumber(uniformity.p)}`
      : '  upper half flat? no p-values above 0.5 to test',
  );
  lines.push('  histogram:');
  for (const line of terminalHistogram(histogram, pi0)) lines.push(`    ${line}`);
  if (findings.length === 0) lines.push('  findings: none');
  else {
    lines.push('  findings:');
    for (const finding of findings) lines.push(...wrap(`[${finding.id}] ${finding.text}`, width, '    ', '      '));
  }
  return `${lines.join('\n')}\n`;
}
