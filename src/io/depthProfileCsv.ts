import type { InterpretationResult } from '../interpret.js';
import { csvComment, csvNumber, csvText } from './csvCell.js';
import { formatVelocity, type LengthUnit } from '../core/units.js';
import { displayText } from '../report/unitText.js';

/** The depth methods written beside the recommended depth, in column order, with their column names. */
const METHOD_COLUMNS: [string, string][] = [['plus-minus', 'plus_minus'], ['GRM', 'grm'], ['delay-time', 'delay_time']];

/**
 * The depth profile as CSV (RFC 4180) for a designer's drawing program or a spreadsheet: one row
 * per geophone, the unit in every column name (`x_m`, `depth_1_m`, ...): station number, position
 * along the line, ground elevation, and for each refractor the recommended depth below ground, its
 * standard error, the refractor elevation, the method, and the depth by each method. Lines starting
 * with `#` above the header carry the line, the layer velocities and every caution and warning,
 * so the numbers never travel without them. Every text cell is neutralised against formula
 * injection (OWASP; see csvCell), comment lines too, piece by piece between commas.
 *
 * With `unit` 'ft' the comment lines (read by people) give feet and ft/s with the SI value in
 * brackets; the columns stay SI, as their names say.
 *
 * @param receivers - every geophone position and its ground elevation, in metres, sorted along the line
 */
export function depthProfileCsv(result: InterpretationResult, receivers: { x: number; elev: number }[], title: string, unit: LengthUnit = 'm'): string {
  const comment = csvComment;
  const lines: string[] = [];
  lines.push(comment(`hammerline depth profile: ${title}; ${result.wave}-wave line; lengths in metres below ground or above datum, velocities in m/s${unit === 'ft' ? ' (the columns; 1 ft = 0.3048 m exactly)' : ''}`));
  if (unit === 'ft') lines.push(comment(`layers (velocity ± standard error): ${result.layers.map((l) => `${l.index}: ${formatVelocity(Math.round(l.velocity), unit)} ± ${formatVelocity(Math.round(l.velocitySe), unit)}`).join('; ')}`));
  else lines.push(comment(`layers (velocity ± standard error, m/s): ${result.layers.map((l) => `${l.index}: ${Math.round(l.velocity)} ± ${Math.round(l.velocitySe)}`).join('; ')}`));
  for (const c of result.cautions) lines.push(comment(`caution: ${(unit === 'm' ? c.message : displayText(c, unit))}`));
  for (const w of result.warnings) lines.push(comment(`warning [${w.code}]: ${(unit === 'm' ? w.message : displayText(w, unit))}`));
  const header = ['station', 'x_m', 'ground_elev_m'];
  for (const r of result.refractors) {
    header.push(`depth_${r.index}_m`, `depth_${r.index}_se_m`, `elev_${r.index}_m`, `method_${r.index}`);
    for (const [, name] of METHOD_COLUMNS) header.push(`depth_${r.index}_${name}_m`);
  }
  lines.push(header.join(','));
  receivers.forEach((receiver, n) => {
    const cells = [csvNumber(n + 1, 0), csvNumber(receiver.x, 3), csvNumber(receiver.elev, 3)];
    for (const r of result.refractors) {
      const i = r.points.findIndex((p) => p.x === receiver.x);
      const p = i >= 0 ? r.points[i] : undefined;
      cells.push(csvNumber(p?.depth, 3), csvNumber(p?.depthSe, 3), csvNumber(p?.elev, 3), p ? csvText(r.pointMethods[i]) : '');
      for (const [method] of METHOD_COLUMNS) cells.push(csvNumber(r.byMethod[method]?.find((q) => q.x === receiver.x)?.depth, 3));
    }
    lines.push(cells.join(','));
  });
  return lines.join('\r\n') + '\r\n';
}
