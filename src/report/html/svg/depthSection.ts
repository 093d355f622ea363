import type { RefractorPoint } from '../../../core/types.js';
import { escapeHtml } from '../escape.js';
import { frame } from './frame.js';
import { c } from './ticks.js';
import { minOf, maxOf } from '../../../core/extent.js';
import { METRES_PER_FOOT, type LengthUnit } from '../../../core/units.js';

export interface SectionRefractor {
  index: number;
  /** Method of the recommended profile. */
  method: string;
  points: RefractorPoint[];
  byMethod: Record<string, RefractorPoint[]>;
  /** Method of each recommended point ("interpolated" where a gap was filled). */
  pointMethods?: string[];
}

export interface SectionInput {
  receivers: { x: number; elev: number }[];
  sources: { id: string; x: number; elev: number }[];
  refractors: SectionRefractor[];
  /** Text of each layer's label, top down, for example "450 ± 6 m/s"; the HTML of it (numbers marked). */
  layerLabels: string[];
  /** Unit the axes are drawn in (positions and elevations are given in metres). Default metres. */
  unit?: LengthUnit;
}

/** Line styles of the depth methods (dash patterns), shared by the figure and its legend. */
export const METHOD_DASH: Record<string, string> = {
  'plus-minus': '1.2 2.4',
  GRM: '6 3',
  'delay-time': '9 3 2 3',
  interpolated: '',
};

/** Colours of the refractors, top down. */
export const REFRACTOR_COLOURS = ['#9c3d10', '#1f4e79', '#2d6a4f', '#6a3d9a'];

/**
 * The depth section: ground surface with the geophones and sources, and for each refractor its
 * recommended elevation (heavy line) inside a band of ± one standard error, the other depth
 * methods as thin dashed lines and the intercept-time depths under the sources as diamonds with
 * ± one standard error. Positions and elevations in metres; the vertical exaggeration is returned
 * for the caption.
 */
export function depthSectionSvg(given: SectionInput, width = 680, height = 330): { svg: string; exaggeration: number } {
  const unit = given.unit ?? 'm';
  const input = unit === 'ft' ? inFeet(given) : given;
  const xs = [...input.receivers.map((r) => r.x), ...input.sources.map((s) => s.x)];
  const elevs: number[] = [...input.receivers.map((r) => r.elev), ...input.sources.map((s) => s.elev)];
  for (const r of input.refractors) {
    for (const p of r.points) elevs.push(p.elev - p.depthSe, p.elev + p.depthSe);
    for (const points of Object.values(r.byMethod)) for (const p of points) elevs.push(p.elev - p.depthSe);
  }
  const top = maxOf(elevs);
  const bottomElev = minOf(elevs);
  const pad = Math.max(1, 0.12 * (top - bottomElev));
  const f = frame({ width, height, xDomain: [minOf(xs), maxOf(xs)], yDomain: [bottomElev - pad, top + pad * 0.5], xTitle: `Position along the line (${unit})`, yTitle: `Elevation (${unit})` });
  const exaggeration = ((f.bottom - f.top) / (f.yDomain[1] - f.yDomain[0])) / ((f.right - f.left) / (f.xDomain[1] - f.xDomain[0]));
  const parts: string[] = [f.axes];
  const path = (points: { x: number; y: number }[]) => points.map((p, i) => `${i === 0 ? 'M' : 'L'}${c(f.x(p.x))} ${c(f.y(p.y))}`).join('');
  // Runs of consecutive points: a gap of more than twice the median step breaks the line.
  const runs = (points: RefractorPoint[]) => {
    const steps = points.slice(1).map((p, i) => p.x - points[i].x).sort((a, b) => a - b);
    const typical = steps.length > 0 ? steps[Math.floor(steps.length / 2)] : Infinity;
    const out: RefractorPoint[][] = [];
    for (const p of points) {
      const run = out[out.length - 1];
      if (run && p.x - run[run.length - 1].x <= 2.01 * typical) run.push(p);
      else out.push([p]);
    }
    return out;
  };
  input.refractors.forEach((r, k) => {
    const colour = REFRACTOR_COLOURS[k % REFRACTOR_COLOURS.length];
    parts.push(`<g class="refractor" data-refractor="${r.index}">`);
    for (const run of runs(r.points)) {
      const upper = run.map((p) => ({ x: p.x, y: p.elev + p.depthSe }));
      const lower = run.map((p) => ({ x: p.x, y: p.elev - p.depthSe })).reverse();
      parts.push(`<path class="band" d="${path([...upper, ...lower])}Z" fill="${colour}"/>`);
    }
    for (const [method, points] of Object.entries(r.byMethod)) {
      if (method === 'intercept-time' || points.length === 0) continue;
      for (const run of runs(points)) parts.push(`<path class="method-line" d="${path(run.map((p) => ({ x: p.x, y: p.elev })))}" stroke="${colour}" stroke-dasharray="${METHOD_DASH[method] ?? '3 3'}"/>`);
    }
    for (const run of runs(r.points)) parts.push(`<path class="recommended" d="${path(run.map((p) => ({ x: p.x, y: p.elev })))}" stroke="${colour}"/>`);
    // Stretches filled by interpolation between covered geophones are drawn over in white dashes.
    const interpolated = r.points.map((p, i) => ({ p, i })).filter(({ i }) => r.pointMethods?.[i] === 'interpolated');
    for (const run of runs(interpolated.map(({ p }) => p))) if (run.length > 1) parts.push(`<path class="interpolated" d="${path(run.map((p) => ({ x: p.x, y: p.elev })))}"/>`);
    for (const p of r.byMethod['intercept-time'] ?? []) {
      const px = f.x(p.x);
      const py = f.y(p.elev);
      parts.push(`<path class="intercept" d="M${c(px)} ${c(f.y(p.elev + p.depthSe))}V${c(f.y(p.elev - p.depthSe))}M${c(px)} ${c(py - 4)}l4 4l-4 4l-4 -4z" stroke="${colour}"/>`);
    }
    parts.push('</g>');
  });
  parts.push(`<path class="ground" d="${path(input.receivers.map((r) => ({ x: r.x, y: r.elev })))}"/>`);
  parts.push('<g class="geophones">');
  for (const r of input.receivers) parts.push(`<line x1="${c(f.x(r.x))}" y1="${c(f.y(r.elev))}" x2="${c(f.x(r.x))}" y2="${c(f.y(r.elev) - 3.5)}"/>`);
  parts.push('</g><g class="sources">');
  for (const s of input.sources) parts.push(`<path d="M${c(f.x(s.x))} ${c(f.y(s.elev) - 1)}l-4 -7h8z"/>`);
  parts.push('</g>');
  // Layer labels half-way between the surfaces above and below, at mid-line.
  const midX = (f.xDomain[0] + f.xDomain[1]) / 2;
  const surfaceAt = (points: { x: number; elev: number }[]) => points.reduce((best, p) => (Math.abs(p.x - midX) < Math.abs(best.x - midX) ? p : best), points[0]);
  const surfaces = [surfaceAt(input.receivers).elev, ...input.refractors.map((r) => (r.points.length > 0 ? surfaceAt(r.points).elev : undefined))];
  input.layerLabels.forEach((label, k) => {
    const above = surfaces[k];
    if (above === undefined) return;
    const below = surfaces[k + 1];
    const yElev = below !== undefined ? (above + below) / 2 : undefined;
    const py = yElev !== undefined ? f.y(yElev) + 4 : Math.min(f.bottom - 6, f.y(above) + 18);
    if (k > input.refractors.length) return;
    parts.push(`<text class="layer-label" x="${c(f.x(midX))}" y="${c(py)}" text-anchor="middle">${label}</text>`);
  });
  const svg = `<svg class="figure-svg" viewBox="0 0 ${width} ${height}" role="img" aria-label="${escapeHtml('Depth section: ground surface and refractors with their uncertainty bands')}">${parts.join('')}</svg>`;
  return { svg, exaggeration };
}

/** The section's positions, elevations and standard errors in feet (1 ft = 0.3048 m exactly). */
function inFeet(input: SectionInput): SectionInput {
  const k = 1 / METRES_PER_FOOT;
  const point = (p: RefractorPoint): RefractorPoint => ({ ...p, x: p.x * k, elev: p.elev * k, depth: p.depth * k, depthSe: p.depthSe * k });
  return {
    ...input,
    receivers: input.receivers.map((r) => ({ x: r.x * k, elev: r.elev * k })),
    sources: input.sources.map((s) => ({ ...s, x: s.x * k, elev: s.elev * k })),
    refractors: input.refractors.map((r) => ({
      ...r,
      points: r.points.map(point),
      byMethod: Object.fromEntries(Object.entries(r.byMethod).map(([m, points]) => [m, points.map(point)])),
    })),
  };
}
