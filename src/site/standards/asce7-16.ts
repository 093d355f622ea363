import { METRES_PER_FOOT } from '../../core/units.js';
import { ASCE_DEPTH_M } from '../vs30.js';
import type { SiteClassStandard } from './types.js';

const ft = (feetPerSecond: number) => feetPerSecond * METRES_PER_FOOT;

/**
 * ASCE 7-16 Table 20.3-1 (the same bounds as ASCE 7-10 and FEMA P-1050), in ft/s converted exactly
 * to m/s. A value on a bound goes to the softer class, as a public USGS table writes the ranges
 * (2,500 < v̄s ≤ 5,000 for B). Source: ../shared/SITE-CLASSES.md, bounds [public], boundary rule
 * [partial].
 */
export const ASCE_7_16: SiteClassStandard = {
  standard: 'ASCE 7-16',
  averagingDepth: ASCE_DEPTH_M,
  table: 'Table 20.3-1',
  bands: [
    { class: 'E', upper: ft(600), description: 'soft clay soil' },
    { class: 'D', lower: ft(600), upper: ft(1200), description: 'stiff soil' },
    { class: 'C', lower: ft(1200), upper: ft(2500), description: 'very dense soil and soft rock' },
    { class: 'B', lower: ft(2500), upper: ft(5000), description: 'rock' },
    { class: 'A', lower: ft(5000), description: 'hard rock' },
  ],
  boundaryRule: 'above the lower bound, up to and including the upper bound: a value on a bound goes to the softer class',
  provenance: 'bounds as published in Table 20.3-1 (checked against public reproductions); the boundary rule follows a public USGS table',
  notFromVelocity: [
    { code: 'asce7-16-class-f', text: 'Class F (Section 20.3.1: liquefiable, quick, highly sensitive or collapsible soils; more than 10 ft of peat or highly organic clay; more than 25 ft of very high plasticity clay; more than 120 ft of soft to medium stiff clay) cannot be assigned from shear-wave velocities; it needs borings and a site response analysis (Section 21.1).' },
    { code: 'asce7-16-class-e-soil', text: 'Class E also applies to any profile with more than 10 ft of soil with PI > 20, w ≥ 40 % and su < 500 psf (Section 20.3.2); only borings and laboratory tests can show it.' },
    { code: 'asce7-16-classes-a-b', text: 'Classes A and B need shear-wave velocities measured on site, and not more than 10 ft of soil between the rock surface and the bottom of a spread footing or mat (Sections 11.4.3 and 20.3).' },
  ],
  // Section 11.4.3 and Section 20.3: A and B from measured velocities (SITE-CLASSES.md: [memory]
  // for the measurement requirement, [partial] for the 10 ft of soil).
  measuredOnly: { classes: ['A', 'B'], label: 'B or stiffer', clause: 'ASCE 7-16 Sections 11.4.3 and 20.3' },
};
