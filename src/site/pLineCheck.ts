import { inWaterBand } from '../core/cautions.js';
import { InputError } from '../core/errors.js';
import { len, si, vel } from '../core/siText.js';
import { median } from '../core/stats.js';
import type { Layer } from '../core/types.js';
import type { WarningLog } from '../core/warnings.js';
import { minOf } from '../core/extent.js';

/** Vp/Vs of an elastic solid with Poisson's ratio ν ≥ 0 is at least sqrt(2) (Vp/Vs = sqrt((2 − 2ν)/(1 − 2ν))). */
export const VP_VS_MIN_ELASTIC = Math.SQRT2;
/**
 * Vp/Vs of soil above the water table, typically about 1.7 to 5 (ν about 0.24 to 0.48). A range
 * of the trade recalled from memory, not taken from a standard; used only to warn.
 */
export const VP_VS_TYPICAL_DRY: [number, number] = [1.7, 5];

/** One S layer compared with the P line at the same depths. */
export interface PLineLayerCheck {
  /** S layer index, 1 = top. */
  layer: number;
  /** Depth range of the S layer (median refractor depths of the S line), in metres; bottom undefined for the deepest. */
  top: number;
  bottom?: number;
  vs: number;
  /** P layer at the middle of the S layer (1 m below its top for the deepest), and its Vp, in m/s. */
  pLayer: number;
  vp: number;
  /** Slowest P layer over the S layer's depth range, in m/s: every Vs must be below it. */
  slowestVp: number;
  ratio: number;
  /** The plausible range applied to the ratio, and where it comes from. */
  range: [number, number | undefined];
  basis: string;
  /** True when the ratio lies in that range. */
  plausible: boolean;
}

export interface PLineCheck {
  file: string;
  layers: PLineLayerCheck[];
}

interface LineLike {
  file: string;
  layers: Layer[];
  refractors: { points: { depth: number }[] }[];
}

/** Median depth of each refractor, top down, in metres (made increasing). */
function medianDepths(line: LineLike): number[] {
  const depths: number[] = [];
  for (const r of line.refractors) {
    const d = median(r.points.map((p) => p.depth));
    if (d === undefined) break;
    depths.push(Math.max(d, depths[depths.length - 1] ?? 0));
  }
  return depths;
}

/** Index (0-based) of the layer of a line at a depth, from its refractor depths. */
function layerAt(depths: number[], depth: number): number {
  let k = 0;
  while (k < depths.length && depth >= depths[k]) k++;
  return k;
}

/**
 * Compares an S-wave line with the P-wave line over the same ground, layer by layer at the same
 * depths (not by layer index): each S layer's depth range comes from the S line's median refractor
 * depths, the Vp at those depths from the P line's. Every Vs must be below the Vp at every depth
 * of its layer (Vs < Vp in the same material: common practice); Vp/Vs must be at least sqrt(2)
 * (elasticity, ν ≥ 0), and above the water table it is typically 1.7 to 5 (warned outside).
 *
 * @throws InputError naming both files and the layer when a Vs is not below the Vp at its depth
 */
export function compareWithPLine(sLine: LineLike, pLine: LineLike, warnings?: WarningLog): PLineCheck {
  const sDepths = medianDepths(sLine);
  const pDepths = medianDepths(pLine);
  const pLayers = pLine.layers.slice(0, pDepths.length + 1);
  const wet = pLayers.findIndex((l) => inWaterBand(l.velocity));
  const layers = sLine.layers.slice(0, sDepths.length + 1).map((s, k): PLineLayerCheck => {
    const top = k === 0 ? 0 : sDepths[k - 1];
    const bottom = k < sDepths.length ? sDepths[k] : undefined;
    const middle = bottom === undefined ? top + 1 : (top + bottom) / 2;
    const p = Math.min(layerAt(pDepths, middle), pLayers.length - 1);
    const first = Math.min(layerAt(pDepths, top), pLayers.length - 1);
    const last = bottom === undefined ? pLayers.length - 1 : Math.min(layerAt(pDepths, Math.max(top, bottom - 1e-6)), pLayers.length - 1);
    const slowestVp = minOf(pLayers.slice(first, last + 1).map((l) => l.velocity));
    if (s.velocity >= slowestVp) {
      throw new InputError({ file: sLine.file },
        `layer ${s.index} (${bottom === undefined ? `below ${top.toFixed(1)} m` : `${top.toFixed(1)} to ${bottom.toFixed(1)} m`}) has Vs ${Math.round(s.velocity)} m/s, not slower than Vp ${Math.round(slowestVp)} m/s at the same depth on the P line ${pLine.file}; shear waves are always slower than P waves in the same material, so check that the files are not swapped and that the S picks are shear arrivals`);
    }
    const vp = pLayers[p].velocity;
    const ratio = vp / s.velocity;
    const saturated = wet >= 0 && p >= wet;
    const range: [number, number | undefined] = saturated ? [VP_VS_MIN_ELASTIC, undefined] : VP_VS_TYPICAL_DRY;
    const basis = saturated
      ? 'at least sqrt 2 (elasticity, Poisson\'s ratio of 0 or more); no upper bound in or below the water table, where Vp follows the pore water'
      : 'about 1.7 to 5, typical of soil and rock above the water table (common practice); at least sqrt 2 by elasticity';
    const plausible = ratio >= range[0] && (range[1] === undefined || ratio <= range[1]);
    return { layer: s.index, top, bottom, vs: s.velocity, pLayer: pLayers[p].index, vp, slowestVp, ratio, range, basis, plausible };
  });
  for (const c of layers) {
    if (c.plausible || warnings === undefined) continue;
    const impossible = c.ratio < VP_VS_MIN_ELASTIC;
    warnings.add(impossible ? 'p-line-ratio-impossible' : 'p-line-ratio-unusual',
      si`S layer ${c.layer} (top at ${len(c.top)}): Vs ${vel(c.vs)} against Vp ${vel(c.vp)} of P layer ${c.pLayer} at the same depth gives Vp/Vs ${c.ratio.toFixed(2)}, ${impossible ? 'below sqrt 2 = 1.41, which no elastic material with a Poisson\'s ratio of 0 or more has' : `outside ${c.range[0]} to ${c.range[1]}, the range typical of soil and rock above the water table`}: check that both lines cover the same ground, the layer depths of both, and the S picks`,
      { layer: c.layer });
  }
  return { file: pLine.file, layers };
}
