import { fromMetres, formatLength, formatVelocity, velocityLabel, type LengthUnit } from '../core/units.js';
import type { SiteAssessment, VsLayer } from '../site/siteAssessment.js';
import { plusMinus, table } from './format.js';
import { displayText } from './unitText.js';
import { maxOf, minOf, pushAll } from '../core/extent.js';

const BASIS: Record<VsLayer['basis'], string> = {
  measured: 'measured',
  poisson: "from Vp and Poisson's ratio",
  'given-vs': 'Vs given for this layer',
  'not-estimated': 'not estimated: give its own value',
};

/** The per-layer shear-wave velocity profile: Vp, Poisson's ratio used, Vs ± standard error, and how each was had. */
export function vsProfileTable(layers: VsLayer[], unit: LengthUnit): string[] {
  const v = (mps: number) => fromMetres(mps, unit);
  const label = velocityLabel(unit);
  const fromVp = layers.some((l) => l.vp !== undefined);
  const rows = layers.map((l) => [
    String(l.index),
    ...(fromVp ? [l.vp === undefined ? '-' : plusMinus(v(l.vp), l.vpSe === undefined ? undefined : v(l.vpSe), 0),
      l.poisson === undefined ? '-' : `${l.poisson.toFixed(2)}${l.poissonRange ? ` (${l.poissonRange[0].toFixed(2)} to ${l.poissonRange[1].toFixed(2)})` : ''}`] : []),
    l.vs === undefined ? '-' : plusMinus(v(l.vs), l.vsSe === undefined ? undefined : v(l.vsSe), 0),
    [BASIS[l.basis], l.saturated === 'water-band' ? 'Vp in the saturated-soil band' : l.saturated === 'below-water-table' ? 'below the water table' : ''].filter(Boolean).join('; '),
  ]);
  const header = ['layer', ...(fromVp ? [`Vp (${label})`, "Poisson's ratio (range drawn)"] : []), `Vs (${label})`, 'basis'];
  return ['  Shear-wave velocity by layer (top down; the last continues below the deepest boundary)', ...table(header, rows).map((s) => `    ${s}`)];
}

/** The site-class section of the readable summary: Vs30 with its range, each class with its probability and cautions. */
export function siteSummary(site: SiteAssessment, unit: LengthUnit): string[] {
  const v = (mps: number) => Math.round(fromMetres(mps, unit)).toString();
  const label = velocityLabel(unit);
  const out: string[] = [];
  const kind = site.estimatedFromVp ? 'ESTIMATED from Vp (not a measured site class)' : site.estimated ? 'ESTIMATED (velocities entered as estimates)' : 'from measured shear-wave velocities';
  out.push(`Site class, ${kind}`);
  const along = site.alongLine.map((a) => a.vs30);
  if (site.draws > 0 && site.vs30Low !== undefined && site.vs30High !== undefined) {
    out.push(`  Vs30 ${formatVelocity(site.vs30, unit)} (5th to 95th percentile ${formatVelocity([site.vs30Low, site.vs30High], unit, 0, ' to ')}, ${site.draws} Monte Carlo draws, seed ${site.seed})`);
  } else {
    out.push(`  Vs30 ${formatVelocity(site.vs30, unit)}; no uncertainty was given (no standard error of any velocity or depth), so no range and no class probabilities are computed`);
  }
  if (along.length > 1) out.push(`  along the line: ${formatVelocity([minOf(along), maxOf(along)], unit, 0, ' to ')} at ${along.length} stations`);
  if (site.extrapolated > 0) out.push(`  ${formatLength(site.extrapolated, unit, 1)} of the top ${formatLength(30, unit, 0)} are extrapolated (the deepest velocity extended)`);
  pushAll(out, vsProfileTable(site.vsProfile, unit));
  pushAll(out, table(
    ['standard', 'table', `v̄s (${label})`, 'class', 'probability', 'note'],
    site.classes.map((c) => [
      c.standard,
      c.table,
      v(c.averageVelocity),
      site.estimated ? `${c.class} (estimated)` : c.class,
      c.probability === undefined ? 'not computed' : `${Math.round(c.probability * 100)} %`,
      [c.borderline ? `borderline: ${c.neighbour ?? 'another class'} possible` : '', c.basis === 'profile shape' ? `by profile shape (velocity alone: ${c.velocityClass})` : '',
        c.classByEstimate ? `needs measured Vs (${c.measuredOnlyClause})` : '',
        c.estimatedRange ? `v̄s/${c.estimatedRange.factor}, v̄s, ${c.estimatedRange.factor} v̄s: ${c.estimatedRange.low.class}, ${c.estimatedRange.central.class}, ${c.estimatedRange.high.class}` : ''].filter(Boolean).join('; '),
    ]),
  ).map((s) => `  ${s}`));
  for (const c of site.classes) for (const note of c.noteTexts) out.push(`  ${c.standard}: ${displayText(note, unit)}`);
  out.push('  Cautions on the site class');
  for (const c of site.cautions) out.push(`  - ${displayText(c, unit)}`);
  out.push('');
  return out;
}
