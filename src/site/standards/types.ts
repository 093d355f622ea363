import type { SiText } from '../../core/siText.js';

/** One class of a site-class table: velocities above `lower` up to and including `upper`, in m/s. */
export interface ClassBand {
  class: string;
  /** Exclusive lower bound in m/s (undefined = no lower bound). */
  lower?: number;
  /** Inclusive upper bound in m/s (undefined = no upper bound). */
  upper?: number;
  description: string;
}

/** A site-class table of one standard and edition. */
export interface SiteClassStandard {
  /** Name as the JSON contract spells it: "ASCE 7-16", "ASCE 7-22", "EN 1998-1:2004". */
  standard: string;
  /** Depth over which the standard averages shear-wave velocity, in metres. */
  averagingDepth: number;
  /** Table the classes come from, for the report. */
  table: string;
  /** Bands from the softest to the hardest. */
  bands: ClassBand[];
  /** How a value exactly on a bound is classed, in words, for the report. */
  boundaryRule: string;
  /**
   * How sure the code is of the bounds (from SITE-CLASSES.md). For contributors only: it is
   * never shown to the user, who is told which table applied and to confirm it in the adopted edition.
   */
  provenance: string;
  /** Classes that shear-wave velocities cannot assign (they need borings or special studies), each with its own caution code. */
  notFromVelocity: { code: string; text: string }[];
  /**
   * Classes the standard reserves for measured shear-wave velocities: an estimate that falls in
   * one of them is reported as `label`, never as the class itself.
   */
  measuredOnly?: {
    classes: string[];
    label: string;
    clause: string;
    /**
     * The note shown with an estimate in one of those classes, when the standard's own reason is
     * not a reservation for measured velocities (EN 1998-1 ground type A rests on a description).
     */
    note?: (vs: number, label: string) => SiText;
  };
  /** Rule for estimated (not measured) velocities, when the edition has one. */
  estimatedFactor?: number;
}

/** Relative tolerance within which a value counts as on a bound (guards unit conversions). */
const ON_BOUND = 1e-9;

/**
 * The band a time-averaged velocity falls in: above the lower bound, up to and including the
 * upper bound, so a value on a bound goes to the softer class.
 */
export function classify(standard: SiteClassStandard, vs: number): ClassBand {
  for (const band of standard.bands) {
    if (band.upper === undefined || vs <= band.upper * (1 + ON_BOUND)) return band;
  }
  return standard.bands[standard.bands.length - 1];
}
