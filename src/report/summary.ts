import { hiddenLayerText, LEFT_OUT } from '../core/cautions.js';
import { fromMetres, velocityLabel, type LengthUnit } from '../core/units.js';
import type { InterpretationResult } from '../interpret.js';
import { VERSION } from '../interpret.js';
import { plusMinus, table } from './format.js';
import type { PLineCheck } from '../site/pLineCheck.js';
import { siteSummary, vsProfileTable } from './siteSummary.js';
import { displayText } from './unitText.js';
import { maxOf, pushAll } from '../core/extent.js';

/** Milliseconds to two decimals, without a negative zero. */
const ms = (seconds: number) => (Math.abs(seconds) < 0.005e-3 ? 0 : seconds * 1e3).toFixed(2);

/** "1 branch", "2 branches". */
export function count(n: number, singular: string, plural = `${singular}s`): string {
  return `${n} ${n === 1 ? singular : plural}`;
}

/**
 * The readable summary of an interpretation for the terminal: layers with velocity ± standard
 * error, depths under each source, then every warning and caution that qualifies them.
 *
 * @param unit - display unit of lengths (velocities follow: m/s or ft/s)
 */
export function summary(result: InterpretationResult, unit: LengthUnit): string {
  const len = (m: number) => fromMetres(m, unit);
  const vel = (mps: number) => fromMetres(mps, unit);
  const vLabel = velocityLabel(unit);
  const out: string[] = [];
  out.push(`hammerline ${VERSION}: ${result.file}`);
  // Each pick once: a zero-offset pick joins every branch of its source (and may be an outlier of each).
  const outliers = new Set(result.fits.flatMap((f) => f.outlierRows.map((row) => `${f.branch.sourceId}|${row}`))).size;
  out.push(`${result.wave}-wave line, ${count(result.fits.length, 'branch', 'branches')} from ${count(new Set(result.fits.map((f) => f.branch.sourceId)).size, 'source')}, ${result.picksUsed} of ${count(result.picksTotal, 'pick')} used (${count(outliers, 'outlier')} left out), line-fit RMS ${(result.fitRmsSeconds * 1e3).toFixed(2)} ms`);
  if (result.records?.length) out.push(`Picks: ${result.wave === 'S' ? 'S-wave onsets (the shear arrival after the P)' : 'first breaks'} picked automatically from ${result.records.length} shot record${result.records.length > 1 ? 's' : ''}`);
  out.push('');
  out.push(result.joint
    ? `Layers (velocity ± standard error; one model of all shots with a delay time per geophone and per source, ${result.joint.refractors} refractor${result.joint.refractors === 1 ? '' : 's'} chosen by the information criterion; dip from forward and reverse branches)`
    : `Layers (velocity ± standard error; true velocity and dip from forward and reverse branches)`);
  pushAll(out, table(
    ['layer', `velocity (${vLabel})`, 'dip of top (deg)', 'seen by'],
    result.layers.map((l) => [
      String(l.index),
      plusMinus(vel(l.velocity), vel(l.velocitySe), 0),
      l.dipDeg === undefined ? (l.index === 1 ? 'surface' : 'unknown') : plusMinus(l.dipDeg, l.dipSeDeg, 1),
      `${l.segmentCount} segment${l.segmentCount === 1 ? '' : 's'}${l.reversed ? ', reversed' : ', one side only (apparent velocity)'}`,
    ]),
  ).map((s) => `  ${s}`));
  out.push('');
  if (result.refractors.length === 0) {
    const leftOut = result.warnings.some((w) => LEFT_OUT.has(w.code));
    out.push(leftOut
      ? 'No refractor with depths: later arrivals were seen, but none gives a refractor whose depth can be computed (see the warnings below), so there is no depth to report.'
      : 'No refractor: the picks fit a single line (the direct wave), so there is no depth to report.');
  }
  for (const r of result.refractors) {
    const top = result.layers[r.index];
    out.push(`Refractor ${r.index} (top of layer ${r.index + 1}, ${Math.round(vel(top.velocity))} ${vLabel}): depth below ground by geophone; recommended: ${r.method}`);
    if (r.points.length === 0) {
      out.push('  no method gives a depth for this refractor');
    } else {
      const others = ['plus-minus', 'GRM', 'delay-time'].filter((m) => (r.byMethod[m] ?? []).length > 0);
      const at = (m: string, x: number) => r.byMethod[m]?.find((p) => p.x === x);
      pushAll(out, table(
        ['x (' + unit + ')', `depth (${unit})`, `elevation (${unit})`, 'method', ...others.map((m) => `${m} (${unit})`)],
        r.points.map((p, i) => [
          len(p.x).toFixed(2), plusMinus(len(p.depth), len(p.depthSe), 2), len(p.elev).toFixed(2), r.pointMethods[i],
          ...others.map((m) => { const q = at(m, p.x); return q ? len(q.depth).toFixed(2) : '-'; }),
        ]),
      ).map((s) => `  ${s}`));
    }
    const intercept = r.byMethod['intercept-time'] ?? [];
    if (intercept.length > 0) {
      out.push(`  Under the sources (intercept-time): ${intercept.map((p) => `${p.sourceId} ${plusMinus(len(p.depth), len(p.depthSe), 2)} ${unit}`).join('; ')}`);
    }
    const grmInfo = r.methodInfo['GRM'];
    if (grmInfo) out.push(`  GRM optimum XY ${fromMetres(Number(grmInfo.optimum_xy_m), unit).toFixed(2)} ${unit} (from the ${String(grmInfo.optimum_xy_basis)}), sources ${String(grmInfo.source_forward)} and ${String(grmInfo.source_reverse)}`);
    const velocities = Object.entries(r.methodInfo).filter(([, info]) => info.velocity_mps !== undefined).map(([m, info]) => `${m} ${plusMinus(vel(Number(info.velocity_mps)), vel(Number(info.velocity_se_mps)), 0)}`);
    if (velocities.length > 0) out.push(`  Refractor velocity by method (${vLabel}): ${velocities.join('; ')}`);
    const va = result.velocityAnalysis?.find((c) => c.refractor === r.index);
    if (va) out.push(`  Velocity analysis (GRM, Palmer 1980; sources ${va.sourceForward} and ${va.sourceReverse}, XY ${len(va.xy).toFixed(2)} ${unit}): ${plusMinus(vel(va.velocity), vel(va.se), 0)} ${vLabel} against the layer velocity ${plusMinus(vel(va.layerVelocity), vel(va.layerSe), 0)} ${vLabel} (${va.difference >= 0 ? '+' : ''}${(va.difference * 100).toFixed(1)} %${va.agrees ? ', within their combined standard error or 5 %' : ''})`);
    if (r.hiddenLayer) out.push(`  Hidden-layer limit: ${displayText(hiddenLayerText(r), unit)}`);
    const qualifying = result.warnings.filter((w) => w.layer === r.index + 1);
    for (const w of qualifying) out.push(`  ! [${w.code}] ${displayText(w, unit)}`);
    out.push('');
  }
  for (const p of result.joint?.possible ?? []) {
    out.push(`Possible refractor below layer ${p.index}: about ${plusMinus(vel(p.velocity), vel(p.velocitySe), 0)} ${vLabel}, from ${p.picks} picks of ${p.sources.join(', ')}; no depths (${p.failed.join('; ')})`, '');
  }
  const noise = result.pickNoise;
  out.push(`Pick noise: ${(noise.sigma * 1e3).toFixed(2)} ms, from the ${noise.source} of the picks${noise.reciprocal && noise.source !== 'reciprocal times' ? `; reciprocal times give ${(noise.reciprocal.sigma * 1e3).toFixed(2)} ms over ${noise.reciprocal.count} pair${noise.reciprocal.count === 1 ? '' : 's'}` : ''}`);
  if (result.forward) {
    const fw = result.forward;
    const offEnd = fw.sources.filter((s) => s.offEnd);
    out.push(`Forward check: first arrivals computed through the interpreted section match the ${count(fw.picks, 'pick')} of ${count(fw.sources.length, 'source')} to ${(fw.rms * 1e3).toFixed(2)} ms RMS (worst ${(fw.worst.difference * 1e3).toFixed(2)} ms, source ${fw.worst.sourceId} at x = ${len(fw.worst.receiverX).toFixed(2)} ${unit}${fw.timeShift !== 0 ? `; computed times include the ${(fw.timeShift * 1e3).toFixed(2)} ms trigger delay fitted by the layered inversion` : ''})`);
    out.push(`  By source (ms RMS): ${fw.sources.map((s) => `${s.sourceId} ${(s.rms * 1e3).toFixed(2)}${s.offEnd ? ' (off the end)' : ''}`).join('; ')}`);
    if (offEnd.length > 0) out.push(`  Sources off the ends: the section beyond the geophones is not known, so the delay there is taken from their picks (${offEnd.map((s) => `${s.sourceId} ${s.corrections.map((c) => `${ms(c.correction)} ms on the layer ${c.layer} head wave`).join(', ') || 'none'}`).join('; ')}); the RMS shows how well the section under the geophones explains the rest of their picks.`);
  }
  if (result.inversion) {
    const inv = result.inversion;
    if (inv.rmsBefore !== undefined && inv.rmsAfter !== undefined) {
      out.push(`Layered inversion: over all ${inv.picks} picks (sources off the ends included), the section from the delay-time methods fits to ${(inv.rmsBefore * 1e3).toFixed(2)} ms RMS and the inverted section to ${(inv.rmsAfter * 1e3).toFixed(2)} ms (${inv.iterations} iteration${inv.iterations === 1 ? '' : 's'}${inv.timeShift !== undefined ? `, every pick ${(inv.timeShift * 1e3).toFixed(2)} ± ${((inv.timeShiftSe ?? NaN) * 1e3).toFixed(2)} ms late, as a trigger delay` : ''}); ${inv.kept ? 'kept: the recommended depths and the layer velocities above are the inverted ones' : 'not kept: the improvement is too small, so the depths above are from the delay-time methods'}`);
    } else {
      out.push(`Layered inversion: not run (${inv.reason})`);
    }
  }
  if (result.reciprocal.length > 0) {
    const bad = result.reciprocal.filter((c) => !c.ok);
    out.push(`Reciprocal times: ${result.reciprocal.length} pair${result.reciprocal.length > 1 ? 's' : ''} checked, ${bad.length} beyond the ${(result.reciprocal[0].tolerance * 1e3).toFixed(2)} ms tolerance${bad.length > 0 ? `: ${bad.map((c) => `${c.sourceA}-${c.sourceB} ${(c.difference * 1e3).toFixed(2)} ms`).join(', ')}` : ''}; largest difference ${(maxOf(result.reciprocal.map((c) => c.difference)) * 1e3).toFixed(2)} ms`);
    out.push('');
  }
  if (result.pLineCheck) pushAll(out, pLineSummary(result.pLineCheck, unit));
  if (result.site) pushAll(out, siteSummary(result.site, unit));
  else if (result.siteNotClassified) {
    out.push('Site class: not estimated', `  ${displayText(result.siteNotClassified.reason, unit)}.`, ...vsProfileTable(result.siteNotClassified.vsLayers, unit), '');
  } else if (result.wave === 'P') out.push('Site class: not computed. Vs cannot be had from Vp alone: give --poisson or --vp-vs to estimate it, or interpret an S-wave line.', '');
  if (result.site && result.records?.length) out.splice(out.length - 1, 0, `  The site class rests on the ${result.wave === 'S' ? 'shear-wave' : 'P-wave'} records ${result.records.join(', ')}.`);
  // A warning that qualifies a refractor is printed once, under it; the rest here.
  const shown = new Set(result.refractors.map((r) => r.index + 1));
  const general = result.warnings.filter((w) => (w.layer === undefined || !shown.has(w.layer)) && !(result.siteNotClassified && w.code === 'vs-from-vp-saturated'));
  const above = result.warnings.length - general.length;
  out.push(result.warnings.length === 0 ? 'Warnings: none' : `Warnings (${result.warnings.length}${above > 0 ? `; ${above} shown above, where ${above === 1 ? 'it qualifies' : 'they qualify'} a result` : ''})`);
  for (const w of general) out.push(`  - [${w.code}] ${displayText(w, unit)}`);
  out.push('');
  out.push('Cautions');
  for (const c of result.cautions) out.push(`  - ${displayText(c, unit)}`);
  return out.join('\n') + '\n';
}

/** The S line against the P line at the same depths (interpret --p-line). */
export function pLineSummary(check: PLineCheck, unit: LengthUnit): string[] {
  const v = (mps: number) => Math.round(fromMetres(mps, unit)).toString();
  const d = (m: number) => fromMetres(m, unit).toFixed(1);
  const rows = check.layers.map((c) => [
    String(c.layer), c.bottom === undefined ? `below ${d(c.top)}` : `${d(c.top)} to ${d(c.bottom)}`, v(c.vs), `${v(c.vp)} (P layer ${c.pLayer})`, c.ratio.toFixed(2),
    `${c.range[0].toFixed(2)} to ${c.range[1] === undefined ? 'no upper bound' : c.range[1].toFixed(2)}`, c.plausible ? 'plausible' : 'OUTSIDE the range',
  ]);
  return [
    `Check against the P line ${check.file}: every Vs below the Vp at the same depth (shear waves are slower than P waves in the same material), and Vp/Vs in a plausible range`,
    ...table(['S layer', `depth (${unit})`, `Vs (${velocityLabel(unit)})`, `Vp at that depth (${velocityLabel(unit)})`, 'Vp/Vs', 'plausible range', 'verdict'], rows).map((s) => `  ${s}`),
    ...[...new Set(check.layers.map((c) => c.basis))].map((b) => `  Range: ${b}.`),
    '',
  ];
}
