import { METRES_PER_FOOT } from '../../core/units.js';
import { ASCE_DEPTH_M } from '../vs30.js';
import type { SiteClassStandard } from './types.js';

const ft = (feetPerSecond: number) => feetPerSecond * METRES_PER_FOOT;

/**
 * ASCE 7-22 Table 20.2-1 (the classes of FEMA P-2082), in ft/s converted exactly to m/s; each
 * range is above its lower bound up to and including its upper bound. Source:
 * ../shared/SITE-CLASSES.md: class set [public], bounds [partial]. The factor 1.3 for estimated
 * velocities is [memory]: very likely, not confirmed.
 */
export const ASCE_7_22: SiteClassStandard = {
  standard: 'ASCE 7-22',
  averagingDepth: ASCE_DEPTH_M,
  table: 'Table 20.2-1',
  bands: [
    { class: 'E', upper: ft(500), description: 'soft soil' },
    { class: 'DE', lower: ft(500), upper: ft(700), description: 'soft to medium stiff soil' },
    { class: 'D', lower: ft(700), upper: ft(1000), description: 'medium stiff soil' },
    { class: 'CD', lower: ft(1000), upper: ft(1450), description: 'medium dense sand or gravel, or stiff to very stiff clay' },
    { class: 'C', lower: ft(1450), upper: ft(2100), description: 'very dense sand or gravel, or very stiff to hard clay' },
    { class: 'BC', lower: ft(2100), upper: ft(3000), description: 'soft rock' },
    { class: 'B', lower: ft(3000), upper: ft(5000), description: 'medium hard rock' },
    { class: 'A', lower: ft(5000), description: 'hard rock' },
  ],
  boundaryRule: 'above the lower bound, up to and including the upper bound: a value on a bound goes to the softer class',
  provenance: 'class set confirmed by a public agency service; bounds from a reproduction of Table 20.2-1, not the standard itself: confirm against the adopted edition',
  notFromVelocity: [
    { code: 'asce7-22-class-f', text: 'Class F (Section 20.2: liquefiable, quick, highly sensitive or collapsible soils, thick peat or highly organic clay, very high plasticity clay, thick soft to medium stiff clay) cannot be assigned from shear-wave velocities; it needs borings and a site response analysis.' },
  ],
  // Section 20.2: classes A and B from measured velocities (as ASCE 7-16; SITE-CLASSES.md [memory]).
  measuredOnly: { classes: ['A', 'B'], label: 'B or stiffer', clause: 'ASCE 7-22 Section 20.2' },
  estimatedFactor: 1.3,
};
