import { len, si, vel } from '../../core/siText.js';
import { VS30_DEPTH_M } from '../vs30.js';
import type { SiteClassStandard } from './types.js';

/**
 * EN 1998-1:2004 Table 3.1 ground types A to D by vs,30, in m/s. The table prints ranges as
 * "360 - 800"; we class a value on a bound with the softer ground type (the conservative reading,
 * and the same rule as the ASCE tables). Ground type E is judged from the profile shape
 * (groundTypeE below), not from vs,30. Source: ../shared/SITE-CLASSES.md [public].
 */
export const EN_1998_1_2004: SiteClassStandard = {
  standard: 'EN 1998-1:2004',
  averagingDepth: VS30_DEPTH_M,
  table: 'Table 3.1',
  bands: [
    { class: 'D', upper: 180, description: 'loose to medium cohesionless soil, or soft to firm cohesive soil' },
    { class: 'C', lower: 180, upper: 360, description: 'deep dense or medium dense sand or gravel, or stiff clay' },
    { class: 'B', lower: 360, upper: 800, description: 'very dense sand or gravel, or very stiff clay, tens of metres thick' },
    { class: 'A', lower: 800, description: 'rock, with at most 5 m of weaker material at the surface' },
  ],
  // The table prints "360 - 800"; a value on a printed bound is classed with the softer ground
  // type (a reading chosen here as the conservative one, documented in DEVELOPERS.md).
  boundaryRule: 'a value on a printed bound (180, 360 or 800 m/s) is classed with the softer ground type; confirm this reading with the National Annex that applies',
  provenance: 'bounds as published in Table 3.1 (public)',
  notFromVelocity: [
    { code: 'en1998-1-s1-s2', text: 'Ground types S1 (at least 10 m of soft clay or silt with PI > 40 and high water content) and S2 (liquefiable soils, sensitive clays, any soil not in A to E or S1) need special studies (Section 3.1.2); they cannot be assigned from shear-wave velocities.' },
  ],
  // Ground type A is described in Table 3.1 as rock or rock-like formation with at most 5 m of
  // weaker material at the surface, as well as by vs,30 > 800 m/s. No clause we know of reserves
  // it for measured velocities in so many words, but an estimate from Vp cannot show the rock the
  // description asks for, and the one way an estimate reaches A on a water-table line is the fit
  // losing the saturated layer (rock then sits under dry soil): so an estimate there is reported
  // as "B or stiffer", the way ASCE 7 reports its reserved classes (a decision of this program,
  // DEVELOPERS.md "Site assessment rules").
  measuredOnly: {
    classes: ['A'],
    label: 'B or stiffer',
    clause: 'EN 1998-1:2004 Section 3.1.2 and Table 3.1',
    note: (vs, label) => si`the estimated vs,30, ${vel(vs)}, lies in the velocity range of ground type A (above ${vel(800)}), but ground type A rests on the description of Table 3.1 (rock or other rock-like geological formation, with at most ${len(5, 0)} of weaker material at the surface) and on measured shear-wave velocities, which an estimate from P-wave velocities cannot give: reported as "${label}". Confirm the ground type with a shear-wave measurement and a boring, and with the National Annex that applies.`,
  },
};

/** Ground type E: 5 to 20 m of soil with vs of type C or D over material with vs > 800 m/s. */
export interface GroundTypeE {
  /** Thickness of the material above the first layer faster than 800 m/s, in metres. */
  soilThickness: number;
  /** Its travel-time-averaged shear-wave velocity, in m/s. */
  soilVelocity: number;
  /** Velocity of the material below, in m/s. */
  baseVelocity: number;
}

/**
 * Whether a profile has the shape of EN 1998-1:2004 ground type E: a surface layer (or layers)
 * of about 5 to 20 m with a travel-time-average vs of type C or D (≤ 360 m/s) over material
 * with vs > 800 m/s. Whether the surface layer is alluvium is a geological judgement the user
 * must make.
 *
 * @param layers - thickness in metres and velocity in m/s, top down, the last one the base
 * @returns the match, or undefined when the profile does not have that shape
 */
export function groundTypeE(layers: { thickness: number; velocity: number }[]): GroundTypeE | undefined {
  const baseIndex = layers.findIndex((l) => l.velocity > 800);
  if (baseIndex <= 0) return undefined;
  const soil = layers.slice(0, baseIndex);
  const soilThickness = soil.reduce((a, l) => a + l.thickness, 0);
  const soilVelocity = soilThickness / soil.reduce((a, l) => a + l.thickness / l.velocity, 0);
  if (soilThickness < 5 || soilThickness > 20 || soilVelocity > 360) return undefined;
  return { soilThickness, soilVelocity, baseVelocity: layers[baseIndex].velocity };
}
