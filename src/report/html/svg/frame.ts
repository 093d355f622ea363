import { escapeHtml } from '../escape.js';
import { c, niceTicks, tickDigits } from './ticks.js';

/** A plot area with linear axes: scales from data to SVG units and the axes drawn as SVG. */
export interface Frame {
  x: (value: number) => number;
  y: (value: number) => number;
  /** Plot area in SVG units. */
  left: number;
  right: number;
  top: number;
  bottom: number;
  /** The axes, grid and axis titles. */
  axes: string;
}

export interface FrameOptions {
  width: number;
  height: number;
  xDomain: [number, number];
  yDomain: [number, number];
  xTitle: string;
  yTitle: string;
  /** Draw y increasing downwards (for time-distance plots drawn the usual way up, leave false). */
  margin?: { left: number; right: number; top: number; bottom: number };
  /** Pixels per data unit forced equal on both axes times this factor (vertical exaggeration); omitted: fill the area. */
  xTicks?: number;
  yTicks?: number;
}

/** Scales and axes of a plot: ticks at round numbers, light grid lines, titles with units. */
export function frame(options: FrameOptions): Frame & { xTickValues: number[]; yTickValues: number[]; xDomain: [number, number]; yDomain: [number, number] } {
  const margin = options.margin ?? { left: 58, right: 16, top: 14, bottom: 42 };
  const xt = niceTicks(options.xDomain[0], options.xDomain[1], options.xTicks ?? 8);
  const yt = niceTicks(options.yDomain[0], options.yDomain[1], options.yTicks ?? 6);
  const left = margin.left;
  const right = options.width - margin.right;
  const top = margin.top;
  const bottom = options.height - margin.bottom;
  const x = (v: number) => left + ((v - xt.low) / (xt.high - xt.low)) * (right - left);
  const y = (v: number) => bottom - ((v - yt.low) / (yt.high - yt.low)) * (bottom - top);
  const xd = tickDigits(xt.step);
  const yd = tickDigits(yt.step);
  const parts: string[] = [];
  parts.push(`<g class="grid">`);
  for (const t of xt.ticks) parts.push(`<line x1="${c(x(t))}" y1="${c(top)}" x2="${c(x(t))}" y2="${c(bottom)}"/>`);
  for (const t of yt.ticks) parts.push(`<line x1="${c(left)}" y1="${c(y(t))}" x2="${c(right)}" y2="${c(y(t))}"/>`);
  parts.push(`</g>`);
  parts.push(`<rect class="plot-border" x="${c(left)}" y="${c(top)}" width="${c(right - left)}" height="${c(bottom - top)}"/>`);
  parts.push(`<g class="tick-labels">`);
  for (const t of xt.ticks) parts.push(`<text x="${c(x(t))}" y="${c(bottom + 14)}" text-anchor="middle">${t.toFixed(xd)}</text>`);
  for (const t of yt.ticks) parts.push(`<text x="${c(left - 6)}" y="${c(y(t) + 3.5)}" text-anchor="end">${t.toFixed(yd)}</text>`);
  parts.push(`</g>`);
  parts.push(`<text class="axis-title" x="${c((left + right) / 2)}" y="${c(options.height - 8)}" text-anchor="middle">${escapeHtml(options.xTitle)}</text>`);
  parts.push(`<text class="axis-title" transform="translate(14 ${c((top + bottom) / 2)}) rotate(-90)" text-anchor="middle">${escapeHtml(options.yTitle)}</text>`);
  return { x, y, left, right, top, bottom, axes: parts.join(''), xTickValues: xt.ticks, yTickValues: yt.ticks, xDomain: [xt.low, xt.high], yDomain: [yt.low, yt.high] };
}

/** Colours of the sources in the time-distance plot: distinct in print and for common colour-vision deficiencies. */
export const SERIES_COLOURS = ['#1f4e79', '#b35806', '#2d7d46', '#7b3294', '#8c6d1f', '#c2185b', '#00838f', '#5d4037', '#455a64', '#9e9d24'];
