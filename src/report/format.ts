import { formatSe } from '../core/units.js';

/** A plain-text table: columns padded to their widest cell, numbers right-aligned. */
export function table(header: string[], rows: string[][]): string[] {
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => (r[i] ?? '').length)));
  const line = (cells: string[]) => cells.map((c, i) => (i === 0 ? c.padEnd(widths[i]) : c.padStart(widths[i]))).join('   ').trimEnd();
  return [line(header), line(widths.map((w) => '-'.repeat(w))), ...rows.map(line)];
}

/** Formats value ± se with the given decimals (more for an se that would read as zero: formatSe), for display. */
export function plusMinus(value: number, se: number | undefined, digits: number): string {
  if (se === undefined || !Number.isFinite(se)) return value.toFixed(digits);
  return `${value.toFixed(digits)} ± ${formatSe(se, digits)}`;
}
