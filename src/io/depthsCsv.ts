import { fromMetres, type LengthUnit } from '../core/units.js';
import { csvComment, csvNumber as decimal, csvText } from './csvCell.js';
import type { InterpretationResult } from '../interpret.js';

/**
 * The depth table by geophone, as CSV (RFC 4180) for drawing programs and spreadsheets: one row per
 * geophone with its ground elevation and, for each refractor, the recommended depth below ground,
 * its standard error, the refractor elevation and the method. Lines starting with `#` above the
 * header carry the file, the layer velocities and every caution and warning, so the numbers never
 * travel without them. Lengths in the given unit.
 */
export function depthsCsv(result: InterpretationResult, receivers: { x: number; elev: number }[], unit: LengthUnit = 'm'): string {
  const len = (m: number | undefined) => (m === undefined ? undefined : fromMetres(m, unit));
  const lines: string[] = [];
  lines.push(csvComment(`hammerline depth table: ${result.file}; lengths in ${unit === 'ft' ? 'feet' : 'metres'}, velocities in ${unit === 'ft' ? 'ft/s' : 'm/s'}`));
  lines.push(csvComment(`layers: ${result.layers.map((l) => `${l.index}: ${Math.round(len(l.velocity)!)} ± ${Math.round(len(l.velocitySe)!)}`).join('; ')}`));
  for (const c of result.cautions) lines.push(csvComment(`caution: ${c.message}`));
  for (const w of result.warnings) lines.push(csvComment(`warning [${w.code}]: ${w.message}`));
  const header = ['x', 'ground_elev'];
  for (const r of result.refractors) header.push(`depth_${r.index}`, `depth_${r.index}_se`, `elev_${r.index}`, `method_${r.index}`);
  lines.push(header.map((h) => csvText(h)).join(','));
  // Point index by position, per refractor: a lookup per geophone instead of a search (long lines).
  const indexByX = result.refractors.map((r) => {
    const index = new Map<number, number>();
    r.points.forEach((p, i) => { if (!index.has(p.x)) index.set(p.x, i); });
    return index;
  });
  for (const receiver of receivers) {
    const cells = [decimal(len(receiver.x), 3), decimal(len(receiver.elev), 3)];
    for (const [k, r] of result.refractors.entries()) {
      const i = indexByX[k].get(receiver.x) ?? -1;
      const p = i >= 0 ? r.points[i] : undefined;
      cells.push(decimal(len(p?.depth), 3), decimal(len(p?.depthSe), 3), decimal(len(p?.elev), 3), p ? csvText(r.pointMethods[i]) : '');
    }
    lines.push(cells.join(','));
  }
  return lines.join('\n') + '\n';
}
