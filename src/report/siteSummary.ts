import { fromMetres, velocityLabel, type LengthUnit } from '../core/units.js';
import type { SiteAssessment } from '../site/siteAssessment.js';
import { table } from './format.js';

/** The site-class section of the readable summary: Vs30 with its range, each class with its probability and cautions. */
export function siteSummary(site: SiteAssessment, unit: LengthUnit): string[] {
  const v = (mps: number) => Math.round(fromMetres(mps, unit)).toString();
  const label = velocityLabel(unit);
  const out: string[] = [];
  const kind = site.estimatedFromVp ? 'ESTIMATED from Vp (not a measured site class)' : site.estimated ? 'ESTIMATED (velocities entered as estimates)' : 'from measured shear-wave velocities';
  out.push(`Site class, ${kind}`);
  const along = site.alongLine.map((a) => a.vs30);
  const spread = site.vs30High - site.vs30Low > 1e-9 * site.vs30;
  out.push(`  Vs30 ${v(site.vs30)} ${label} ${spread ? `(5th-95th percentile ${v(site.vs30Low)} to ${v(site.vs30High)} ${label}, ${site.draws} Monte Carlo draws, seed ${site.seed})` : '(no standard errors were given, so no range)'}`);
  if (along.length > 1) out.push(`  along the line: ${v(Math.min(...along))} to ${v(Math.max(...along))} ${label} at ${along.length} stations`);
  if (site.extrapolated > 0) out.push(`  ${fromMetres(site.extrapolated, unit).toFixed(1)} ${unit} of the top 30 m are extrapolated (the deepest velocity extended)`);
  out.push(...table(
    ['standard', 'table', `v̄s (${label})`, 'class', 'probability', 'note'],
    site.classes.map((c) => [
      c.standard,
      c.table,
      v(c.averageVelocity),
      site.estimated ? `${c.class} (estimated)` : c.class,
      `${Math.round(c.probability * 100)} %`,
      [c.borderline ? `borderline: ${c.neighbour ?? 'another class'} possible` : '', c.basis === 'profile shape' ? `by profile shape (velocity alone: ${c.velocityClass})` : '',
        c.estimatedRange ? `v̄s/1.3, v̄s, 1.3 v̄s: ${c.estimatedRange.low.class}, ${c.estimatedRange.central.class}, ${c.estimatedRange.high.class}` : ''].filter(Boolean).join('; '),
    ]),
  ).map((s) => `  ${s}`));
  for (const c of site.classes) for (const note of c.notes) out.push(`  ${c.standard}: ${note}`);
  out.push('  Cautions on the site class');
  for (const c of site.cautions) out.push(`  - ${c.message}`);
  out.push('');
  return out;
}
