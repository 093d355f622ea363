import type { Layer, Wave } from './types.js';
import type { WarningLog } from './warnings.js';

/** A standing caution: true of every refraction result, shown wherever a depth or class is shown. */
export interface Caution {
  code: string;
  message: string;
}

/** Speed of sound in water, about 1480 to 1500 m/s: saturated soil shows a Vp near it (common practice). */
export const WATER_TABLE_VP_MIN = 1450;
export const WATER_TABLE_VP_MAX = 1650;

/** The cautions every depth carries, whatever the data. */
export function depthCautions(wave: Wave): Caution[] {
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
  if (wave === 'P') {
    cautions.splice(1, 0, {
      code: 'water-table-ambiguity',
      message: 'On a P-wave line a refractor near 1500 m/s may be the water table in soil rather than rock: saturated soil shows the speed of sound in water whatever its stiffness. An S-wave line or a boring tells them apart.',
    });
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
        `layer ${layer.index} (${Math.round(layer.velocity)} m/s) is not faster than layer ${above.index} (${Math.round(above.velocity)} m/s): a refractor must be faster than the layer above it. No depth is computed to it; check the picks and the segment choice, and suspect a lateral change`,
        { layer: layer.index });
    }
    if (wave === 'P' && layer.velocity >= WATER_TABLE_VP_MIN && layer.velocity <= WATER_TABLE_VP_MAX) {
      warnings.add('water-table',
        `refractor ${layer.index - 1} has Vp ${Math.round(layer.velocity)} m/s, within ${WATER_TABLE_VP_MIN}-${WATER_TABLE_VP_MAX} m/s: it may be the water table in soil rather than rock. Do not read it as bedrock without an S-wave line or a boring`,
        { layer: layer.index });
    }
  }
}
