import type { BranchFit } from '../../../core/types.js';
import { escapeHtml } from '../escape.js';
import { frame, SERIES_COLOURS } from './frame.js';
import { c } from './ticks.js';
import { minOf, maxOf } from '../../../core/extent.js';
import { METRES_PER_FOOT, type LengthUnit } from '../../../core/units.js';

/** One source of the time-distance plot, for the legend. */
export interface SourceSeries {
  sourceId: string;
  sourceX: number;
  colour: string;
}

/**
 * The time-distance (travel-time) plot: every first break against receiver position, one colour
 * per source, picks left out of the fits drawn as crosses, and each branch's fitted segments
 * (time = intercept + offset / apparent velocity) drawn over the offsets of their picks.
 * Lengths in metres (drawn in `unit`), times in milliseconds.
 */
export function timeDistanceSvg(fits: BranchFit[], unit: LengthUnit = 'm', width = 680, height = 380): { svg: string; series: SourceSeries[] } {
  // Positions are drawn in the report's unit, so the axis ticks fall on round feet in feet.
  const k = unit === 'ft' ? 1 / METRES_PER_FOOT : 1;
  const sources = [...new Map(fits.map((f) => [f.branch.sourceId, f.branch.sourceX])).entries()].sort((a, b) => a[1] - b[1] || a[0].localeCompare(b[0]));
  const series = sources.map(([sourceId, sourceX], i) => ({ sourceId, sourceX, colour: SERIES_COLOURS[i % SERIES_COLOURS.length] }));
  const colourOf = new Map(series.map((s) => [s.sourceId, s.colour]));
  const xs = fits.flatMap((f) => [f.branch.sourceX, ...f.branch.picks.map((p) => p.receiverX)]).map((x) => x * k);
  const ts = fits.flatMap((f) => f.branch.times.map((t) => t * 1e3));
  const f = frame({ width, height, xDomain: [minOf(xs), maxOf(xs)], yDomain: [0, Math.max(maxOf(ts), 1)], xTitle: `Position along the line (${unit === 'ft' ? 'ft' : 'm'})`, yTitle: 'First-break time (ms)' });
  const parts: string[] = [f.axes];
  parts.push('<g class="segments">');
  for (const fit of fits) {
    const sign = fit.branch.side === 'forward' ? 1 : -1;
    for (const s of fit.segments) {
      const from = s.order === 1 && s.throughOrigin ? 0 : s.firstOffset;
      const t0 = (s.intercept + s.slowness * from) * 1e3;
      const t1 = (s.intercept + s.slowness * s.lastOffset) * 1e3;
      parts.push(`<line x1="${c(f.x((fit.branch.sourceX + sign * from) * k))}" y1="${c(f.y(t0))}" x2="${c(f.x((fit.branch.sourceX + sign * s.lastOffset) * k))}" y2="${c(f.y(t1))}" stroke="${colourOf.get(fit.branch.sourceId)}"/>`);
    }
  }
  parts.push('</g><g class="picks">');
  for (const fit of fits) {
    const colour = colourOf.get(fit.branch.sourceId)!;
    const outliers = new Set(fit.outlierRows);
    fit.branch.picks.forEach((p, i) => {
      const px = f.x(p.receiverX * k);
      const py = f.y(fit.branch.times[i] * 1e3);
      if (outliers.has(p.row)) parts.push(`<path class="outlier" d="M${c(px - 3)} ${c(py - 3)}L${c(px + 3)} ${c(py + 3)}M${c(px - 3)} ${c(py + 3)}L${c(px + 3)} ${c(py - 3)}" stroke="${colour}"/>`);
      else parts.push(`<circle cx="${c(px)}" cy="${c(py)}" r="1.9" fill="${colour}"/>`);
    });
  }
  parts.push('</g><g class="sources">');
  for (const s of series) {
    const px = f.x(s.sourceX * k);
    parts.push(`<path d="M${c(px)} ${c(f.bottom)}l-4.5 7h9z" fill="${s.colour}"/>`);
  }
  parts.push('</g>');
  const svg = `<svg class="figure-svg" viewBox="0 0 ${width} ${height}" role="img" aria-label="${escapeHtml('Time-distance plot of the first breaks with the fitted segments')}">${parts.join('')}</svg>`;
  return { svg, series };
}
