import { escapeHtml } from '../escape.js';
import { frame } from './frame.js';
import { c, niceTicks } from './ticks.js';
import { maxOf, minOf } from '../../../core/extent.js';
import { METRES_PER_FOOT, type LengthUnit } from '../../../core/units.js';

/** The part of a hammerline/tomogram@1 document the figure draws. */
export interface TomogramDocument {
  grid: { x0_m: number; top_elev_m: number; cell_m: number; nx: number; nz: number; velocity_mps: (number | null)[] };
  contours: { velocity_mps: number; points: { x_m: number; elev_m: number | null; covered: boolean }[] }[];
}

/** Colours of the velocity bands, slow to fast: a sequential scale of our own, legible in greyscale. */
const BAND_COLOURS = ['#f7f1dc', '#efe0b4', '#e3c98a', '#cfae6a', '#a9a27a', '#7f9a8a', '#5a8a94', '#3f7597', '#2d5d8c', '#1f4570', '#152f50'];

/**
 * The tomogram as SVG: each grid node's velocity as a cell coloured by velocity band (cells no pick
 * samples left blank), consecutive cells of one band in a row drawn as one rectangle, the velocity
 * contours as dark lines, the layered section's refractors as dashed lines for comparison, and the
 * ground surface. Positions and elevations in metres, velocities in m/s.
 */
export function tomogramSvg(given: TomogramDocument, groundGiven: { x: number; elev: number }[], refractorsGiven: { x: number; elev: number }[][], unit: LengthUnit = 'm', width = 680, height = 330): { svg: string; bands: { low: number; high: number; colour: string }[]; exaggeration: number } {
  // In feet every position, elevation, cell size and velocity is drawn in ft and ft/s.
  const k = unit === 'ft' ? 1 / METRES_PER_FOOT : 1;
  const scaled = (p: { x: number; elev: number }) => ({ x: p.x * k, elev: p.elev * k });
  const ground = groundGiven.map(scaled);
  const refractors = refractorsGiven.map((r) => r.map(scaled));
  const t: TomogramDocument = k === 1 ? given : {
    grid: { ...given.grid, x0_m: given.grid.x0_m * k, top_elev_m: given.grid.top_elev_m * k, cell_m: given.grid.cell_m * k, velocity_mps: given.grid.velocity_mps.map((v) => (v === null ? null : v * k)) },
    contours: given.contours.map((contour) => ({ ...contour, velocity_mps: contour.velocity_mps * k, points: contour.points.map((p) => ({ ...p, x_m: p.x_m * k, elev_m: p.elev_m === null ? null : p.elev_m * k })) })),
  };
  const g = t.grid;
  const velocities = g.velocity_mps.filter((v): v is number => v !== null);
  const scale = niceTicks(minOf(velocities), maxOf(velocities), BAND_COLOURS.length);
  const bands = scale.ticks.slice(0, -1).map((low, i) => ({ low, high: scale.ticks[i + 1], colour: BAND_COLOURS[Math.min(BAND_COLOURS.length - 1, Math.round((i * (BAND_COLOURS.length - 1)) / Math.max(1, scale.ticks.length - 2)))] }));
  const bandOf = (v: number) => Math.min(bands.length - 1, Math.max(0, Math.floor((v - scale.low) / scale.step)));
  const x0 = g.x0_m - g.cell_m / 2;
  const x1 = g.x0_m + (g.nx - 0.5) * g.cell_m;
  const bottom = g.top_elev_m - (g.nz - 0.5) * g.cell_m;
  const f = frame({ width, height, xDomain: [x0, x1], yDomain: [bottom, Math.max(g.top_elev_m, ...ground.map((p) => p.elev))], xTitle: `Position along the line (${unit})`, yTitle: `Elevation (${unit})` });
  const exaggeration = ((f.bottom - f.top) / (f.yDomain[1] - f.yDomain[0])) / ((f.right - f.left) / (f.xDomain[1] - f.xDomain[0]));
  const parts: string[] = [f.axes, '<g class="cells">'];
  for (let j = 0; j < g.nz; j++) {
    const top = g.top_elev_m - (j - 0.5) * g.cell_m;
    let i = 0;
    while (i < g.nx) {
      const v = g.velocity_mps[j * g.nx + i];
      if (v === null) { i++; continue; }
      const band = bandOf(v);
      let end = i + 1;
      while (end < g.nx && g.velocity_mps[j * g.nx + end] !== null && bandOf(g.velocity_mps[j * g.nx + end]!) === band) end++;
      const left = f.x(g.x0_m + (i - 0.5) * g.cell_m);
      const right = f.x(g.x0_m + (end - 0.5) * g.cell_m);
      parts.push(`<rect x="${c(left)}" y="${c(f.y(top))}" width="${c(right - left + 0.3)}" height="${c(f.y(top - g.cell_m) - f.y(top) + 0.3)}" fill="${bands[band].colour}"/>`);
      i = end;
    }
  }
  parts.push('</g>');
  const path = (points: { x: number; y: number }[]) => points.map((p, k) => `${k === 0 ? 'M' : 'L'}${c(f.x(p.x))} ${c(f.y(p.y))}`).join('');
  for (const r of refractors) if (r.length > 1) parts.push(`<path class="layered" d="${path(r.map((p) => ({ x: p.x, y: p.elev })))}"/>`);
  for (const contour of t.contours) {
    const runs: { x: number; y: number }[][] = [[]];
    for (const p of contour.points) {
      if (p.elev_m === null || !p.covered) { if (runs[runs.length - 1].length > 0) runs.push([]); continue; }
      runs[runs.length - 1].push({ x: p.x_m, y: p.elev_m });
    }
    for (const run of runs) if (run.length > 1) parts.push(`<path class="contour" d="${path(run)}"/>`);
  }
  parts.push(`<path class="ground" d="${path(ground.map((p) => ({ x: p.x, y: p.elev })))}"/>`);
  const svg = `<svg class="figure-svg" viewBox="0 0 ${width} ${height}" role="img" aria-label="${escapeHtml('Traveltime tomogram: velocity by grid cell, with velocity contours and the layered refractors')}">${parts.join('')}</svg>`;
  return { svg, bands, exaggeration };
}
