import { len, si, vel, type Quantity } from './siText.js';
import type { Layer, Wave } from './types.js';
import type { WarningLog } from './warnings.js';

/** A standing caution: true of every refraction result, shown wherever a depth or class is shown. */
export interface Caution {
  code: string;
  /** The sentence, SI units. */
  message: string;
  /** The same sentence as text and SI quantities, when it holds lengths or velocities (see si``). */
  parts?: (string | Quantity)[];
}

/** True when a P-wave layer's velocity lies in the band of saturated soil. */
export function inWaterBand(velocity: number): boolean {
  return velocity >= WATER_TABLE_VP_MIN && velocity <= WATER_TABLE_VP_MAX;
}

/** Speed of sound in water, about 1480 to 1500 m/s: saturated soil shows a Vp near it (common practice). */
export const WATER_TABLE_VP_MIN = 1450;
export const WATER_TABLE_VP_MAX = 1650;

/**
 * The cautions every depth carries; on a P-wave line with a layer in the band of saturated soil
 * (1450-1650 m/s) also the water-table caution (a caution shown on every line is read by no one).
 *
 * @param layers - the line's layers; omitted, the water-table caution goes with every P line
 */
export function depthCautions(wave: Wave, layers?: Layer[]): Caution[] {
  const cautions: Caution[] = [
    {
      code: 'hidden-layer',
      message: 'Refraction sees only layers each faster than the one above and thick enough for their head wave to arrive first. A thin intermediate layer (a hidden layer) makes the computed depths too shallow; a slower layer under a faster one (a velocity inversion) is invisible and makes them too deep.',
    },
    {
      code: 'interpretation-model',
      message: 'Depths assume planar, laterally uniform layers between the points where they are computed; they are estimates to be checked against borings or test pits before a foundation is designed on them.',
    },
    {
      code: 'professional-judgement',
      message: 'These results support, and do not replace, the judgement of the licensed professional responsible for the site; local codes govern.',
    },
  ];
  if (wave === 'P' && (layers === undefined || layers.some((l) => inWaterBand(l.velocity)))) {
    const text = si`On a P-wave line a refractor near ${vel(1500)} may be the water table in soil rather than rock: saturated soil shows the speed of sound in water whatever its stiffness. An S-wave line or a boring tells them apart.`;
    cautions.splice(1, 0, { code: 'water-table-ambiguity', message: text.text, parts: text.parts });
  }
  return cautions;
}

/**
 * Cautions the data trigger: a refractor slower than the layer above it, and a P-wave refractor
 * whose velocity lies in the band of saturated soil.
 */
export function checkLayerCautions(layers: Layer[], wave: Wave, warnings: WarningLog): void {
  for (let i = 1; i < layers.length; i++) {
    const above = layers[i - 1];
    const layer = layers[i];
    if (layer.velocity <= above.velocity) {
      warnings.add('velocity-inversion',
        si`layer ${layer.index} (${vel(layer.velocity)}) is not faster than layer ${above.index} (${vel(above.velocity)}): a refractor must be faster than the layer above it. No depth is computed to it; check the picks and the segment choice, and suspect a lateral change`,
        { layer: layer.index });
    }
    if (wave === 'P' && inWaterBand(layer.velocity)) {
      warnings.add('water-table',
        si`refractor ${layer.index - 1} has Vp ${vel(layer.velocity)}, within ${vel([WATER_TABLE_VP_MIN, WATER_TABLE_VP_MAX], 0, '-')}: it may be the water table in soil rather than rock. Do not read it as bedrock without an S-wave line or a boring`,
        { layer: layer.index });
    }
  }
}

/** What the hidden-layer check needs of a refractor (see depth/hiddenLayer.ts). */
export interface HiddenLayerInput {
  index: number;
  points: { depth: number; depthSe: number }[];
  hiddenLayer?: { hiddenVelocity: number; maxThickness: number; depthUnderestimate: number };
}

/**
 * The hidden-layer limit of a refractor (Soske 1959) as a sentence: shown once, under the
 * refractor, wherever its depths are shown.
 */
export function hiddenLayerText(r: HiddenLayerInput) {
  const h = r.hiddenLayer!;
  return si`a layer of about ${vel(h.hiddenVelocity)} up to ${len(h.maxThickness)} thick could lie above refractor ${r.index} without ever arriving first (Soske 1959); the refractor would then be up to ${len(h.depthUnderestimate)} deeper than computed`;
}

/**
 * Raises `hidden-layer-limit` only where it matters: where the line shows a sign of a layer it
 * did not keep (a segment dropped or merged by the layer-count guards: a layer seen on too few
 * picks is the visible edge of a hidden one) and the possible error exceeds the depth's own
 * uncertainty (twice its median standard error). Elsewhere the limit is shown as information
 * under the refractor and the standing hidden-layer caution applies; a warning raised on every
 * line is read by no one.
 */
export function checkHiddenLayers(refractors: HiddenLayerInput[], warnings: WarningLog): void {
  const unkept = warnings.items.filter((w) => w.code === 'layer-dropped' || w.code === 'layer-merged');
  if (unkept.length === 0) return;
  for (const r of refractors) {
    if (r.hiddenLayer === undefined || r.points.length === 0) continue;
    const ses = r.points.map((p) => p.depthSe).sort((a, b) => a - b);
    const depthSe = ses[ses.length >> 1];
    if (!(r.hiddenLayer.depthUnderestimate > 2 * depthSe)) continue;
    const text = hiddenLayerText(r);
    warnings.add('hidden-layer-limit', { text: `${text.text}; the fit left out a segment (${unkept.map((w) => w.code).join(', ')}), so such a layer is more than a possibility here: check the segments, or a boring`, parts: [...text.parts, `; the fit left out a segment (${unkept.map((w) => w.code).join(', ')}), so such a layer is more than a possibility here: check the segments, or a boring`] }, { layer: r.index + 1 });
  }
}

/**
 * Fastest top-layer shear-wave velocity taken as soil: 762 m/s (2,500 ft/s), the bound between
 * site classes C (very dense soil and soft rock) and B (rock) of ASCE 7-16 Table 20.3-1. A direct
 * S wave faster than that at the surface of a soil site is most often the P arrival picked on
 * horizontal geophones (dry soil has a Vp of roughly 200 to 800 m/s: from memory, the usual ranges
 * of refraction texts).
 */
export const SHEAR_TOP_LAYER_MAX = 762;

/** On an S-wave line: a warning when the top layer (the direct wave) is too fast for a shear wave in soil. */
export function checkShearTopLayer(layers: Layer[], wave: Wave, warnings: WarningLog): void {
  const top = layers.find((l) => l.index === 1);
  if (wave !== 'S' || top === undefined || !(top.velocity > SHEAR_TOP_LAYER_MAX)) return;
  warnings.add('shear-top-layer-fast',
    si`layer 1 of this S-wave line has Vs ${vel(top.velocity)}, above ${vel(SHEAR_TOP_LAYER_MAX)}, the lower bound of site class B (rock) in ASCE 7-16 Table 20.3-1. Unless rock is exposed at the surface, a direct shear wave this fast is unlikely in soil and the picks are probably on the P arrival, which comes first and weaker on horizontal geophones: check the picks against the records, or against a P-wave line over the same ground`,
    { layer: 1 });
}

/**
 * Warning codes that say a later arrival was seen but left without depths (no velocity, slower than
 * the layer above, or too thin a refractor): with no refractor left, the summary and the report
 * then say so instead of "the direct wave alone".
 */
export const LEFT_OUT = new Set(['unresolved-layer', 'velocity-inversion', 'possible-refractor']);
