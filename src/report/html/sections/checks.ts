import type { Caution } from '../../../core/cautions.js';
import { displayText } from '../../unitText.js';
import { escapeHtml } from '../escape.js';
import { quantityOf, type Figures } from '../figures.js';
import { findStep, parameter } from '../references.js';
import type { ReportInput } from '../types.js';

/** Labels of quality-check figures of the `qc` block, in milliseconds unless the key says otherwise. */
const QC_LABELS: Record<string, string> = {
  fit_rms_ms: 'RMS residual of the line fits of all branches (pick scatter about the segments)',
  forward_rms_ms: 'RMS difference between the picks and first arrivals computed through the interpreted section',
  pick_noise_ms: 'Pick noise estimated from the data',
  inversion_rms_ms: 'RMS residual of the layered-model inversion',
  forward_time_shift_ms: 'Time shift common to every pick (trigger delay) in the section checked',
};

/** Section 8: reciprocal times, forward residuals, picks left out, flagged or fixed by hand. */
export function qualitySection(input: ReportInput, fig: Figures): string {
  const qc = (fig.get('qc') as Record<string, unknown>) ?? {};
  const rows: string[] = [];
  for (const [key, value] of Object.entries(qc)) {
    if (typeof value !== 'number' && value !== null) continue;
    if (key === 'picks_used' || key === 'picks_total' || key === 'forward_picks') continue;
    const kind = quantityOf(key);
    const digits = key.endsWith('_ms') ? 2 : 3;
    const shown = kind !== undefined ? fig.withUnit(kind, () => fig.num(`qc.${key}`, digits)) : `${fig.num(`qc.${key}`, digits)}${key.endsWith('_ms') ? ' ms' : ''}`;
    rows.push(`<tr><th scope="row">${escapeHtml(QC_LABELS[key] ?? key.replace(/_/g, ' '))}</th><td class="n">${value === null ? 'not computed (no complete section)' : shown}</td></tr>`);
  }
  rows.push(`<tr><th scope="row">First breaks used in the fits, of those supplied</th><td class="n">${fig.num('qc.picks_used', 0)} of ${fig.num('qc.picks_total', 0)}</td></tr>`);
  if (fig.get('qc.forward_worst') !== undefined) rows.push(`<tr><th scope="row">Largest forward difference</th><td class="n">${fig.num('qc.forward_worst.difference_ms', 2)} ms (source ${fig.text('qc.forward_worst.source_id')}, x = ${fig.withUnit('length', () => fig.num('qc.forward_worst.receiver_x_m', 2))})</td></tr>`);
  const reciprocal = (fig.get('qc.reciprocal') as { source_a: string; source_b: string; ok: boolean }[]) ?? [];
  const recRows = reciprocal.map((c, i) => `<tr><td>${escapeHtml(c.source_a)} – ${escapeHtml(c.source_b)}</td><td class="n">${fig.num(`qc.reciprocal.${i}.time_ab_ms`, 2)}</td><td class="n">${fig.num(`qc.reciprocal.${i}.time_ba_ms`, 2)}</td><td class="n">${fig.num(`qc.reciprocal.${i}.difference_ms`, 2)}</td><td class="n">${fig.num(`qc.reciprocal.${i}.tolerance_ms`, 2)}</td><td>${c.ok ? 'within tolerance' : '<strong>exceeds tolerance</strong>'}</td></tr>`).join('');
  const recTable = reciprocal.length === 0 ? '<p>No pair of sources records each other’s position, so no reciprocal time could be checked.</p>'
    : `<table class="data"><thead><tr><th>Sources A – B</th><th>Time A→B (ms)</th><th>Time B→A (ms)</th><th>Difference (ms)</th><th>Tolerance (ms)</th><th>Result</th></tr></thead><tbody>${recRows}</tbody></table>`;
  const branches = (fig.get('branches') as { source_id: string; side: string; outlier_rows: number[]; segments_chosen_by: string; segments: unknown[] }[]) ?? [];
  const branchRows = branches.map((b, i) => `<tr><td>${escapeHtml(b.source_id)}</td><td>${b.side === 'forward' ? '+x' : '−x'}</td><td class="n">${fig.num(`branches.${i}.picks`, 0)}</td><td class="n">${b.segments.map((_, j) => fig.num(`branches.${i}.segments.${j}.apparent_velocity_mps`, 0)).join(', ')}</td><td>${b.segments_chosen_by === 'user' ? '<strong>fixed by the interpreter</strong>' : 'criterion (BIC)'}</td><td class="n">${fig.num(`branches.${i}.residual_sd_ms`, 2)}</td><td>${b.outlier_rows.length === 0 ? 'none' : `row ${b.outlier_rows.join(', ')}`}</td></tr>`).join('');
  const edits = editedChoices(input, fig);
  const picking = fig.get('picking') as { status_counts?: Record<string, number> } | undefined;
  const pickingText = picking?.status_counts ? `<p>Automatic picking of the records: ${Object.entries(picking.status_counts).map(([status, n]) => `${escapeHtml(status)}: ${fig.num(`picking.status_counts.${status}`, 0)}`).join('; ')} traces. Traces left unpicked are named in section 9.</p>` : '';
  return `<section id="qc"><h2><span class="no">8</span> Quality checks</h2>
<table class="data kv"><tbody>${rows.join('')}</tbody></table>
<h3>Reciprocal times</h3>${recTable}
<h3>Branch fits, flagged picks and choices made by hand</h3>
<table class="data"><thead><tr><th>Source</th><th>Side</th><th>Picks</th><th>Apparent velocities of the segments (${fig.velocityLabel})</th><th>Segments chosen by</th><th>Residual SD (ms)</th><th>Picks left out as outliers (input rows)</th></tr></thead><tbody>${branchRows}</tbody></table>
${pickingText}${pickEditTable(fig)}<p>${edits}</p></section>`;
}

function editedChoices(input: ReportInput, fig: Figures): string {
  const step = findStep(input.result.history, 'segmentedRegression');
  const segments = (parameter(step, 'fixed_segments') ?? {}) as Record<string, number>;
  const breakpoints = (parameter(step, 'fixed_breakpoints_m') ?? {}) as Record<string, number[]>;
  const parts = [
    ...Object.entries(segments).map(([branch, n]) => `${branch === '*' ? 'every branch' : escapeHtml(branch)}: ${n} segment${n === 1 ? '' : 's'}`),
    ...Object.entries(breakpoints).map(([branch, xs]) => `${escapeHtml(branch)}: breakpoints at offsets ${fig.plain('length', xs, 2)}`),
  ];
  if (parameter(step, 'direct_through_origin') === true) parts.push('direct wave forced through the origin');
  const edited = ((fig.get('pick_edits') as unknown[] | undefined) ?? []).length > 0;
  if (parts.length === 0) return edited ? 'No segment choice was fixed by hand: the segments are those chosen by the criterion, on the picks above.' : 'No pick was edited and no segment choice was fixed by hand: the segments are those chosen by the criterion.';
  return `Choices fixed by the interpreter: ${parts.join('; ')}.`;
}

/** The picks set or cleared by hand in the field app (a project file), each beside the pick it replaced. */
function pickEditTable(fig: Figures): string {
  const edits = fig.get('pick_edits') as { file: string; trace?: number; row?: number; source_id: string; time_ms: number | null; before_ms: number | null }[] | undefined;
  if (edits === undefined) return '';
  if (edits.length === 0) return '<p>The project file holds no pick set by hand: every first break is as picked automatically or as given in the table.</p>';
  const fromRecords = edits.some((e) => e.trace !== undefined);
  const rows = edits.map((e, i) => `<tr><td class="file">${escapeHtml(e.file)}</td><td class="n">${e.trace !== undefined ? fig.num(`pick_edits.${i}.trace`, 0) : fig.num(`pick_edits.${i}.row`, 0)}</td><td>${escapeHtml(e.source_id)}</td><td class="n">${fig.num(`pick_edits.${i}.receiver_x_m`, 2)}</td><td class="n">${e.before_ms === null ? 'unpicked' : fig.num(`pick_edits.${i}.before_ms`, 2)}</td><td class="n">${e.time_ms === null ? 'cleared, left out' : fig.num(`pick_edits.${i}.time_ms`, 2)}</td></tr>`).join('');
  const set = edits.filter((e) => e.time_ms !== null).length;
  return `<h3>First breaks set by hand</h3><p>${set} first break${set === 1 ? ' was' : 's were'} set by hand and ${edits.length - set} cleared in the field app (project file); the interpretation uses the times set by hand in place of the ${fromRecords ? 'automatic picks' : 'times of the table'} and leaves the cleared ones out. Each edit should be checked on the record by a second interpreter before the depths are relied on.</p>
<table class="data"><thead><tr><th>File</th><th>${fromRecords ? 'Trace' : 'File row'}</th><th>Source</th><th>Receiver x (${fig.lengthLabel})</th><th>${fromRecords ? 'Automatic pick' : 'Time in the table'} (ms)</th><th>Time used (ms)</th></tr></thead><tbody>${rows}</tbody></table>`;
}

/** Section 9: every warning the interpretation raised. */
export function warningSection(input: ReportInput, fig: Figures): string {
  const warnings = (fig.get('warnings') as { code: string; message: string }[]) ?? [];
  // The document's sentences are SI; in feet those of the result (same order) give their quantities.
  const sentence = (w: { message: string }, i: number) => escapeHtml(fig.unit === 'm' ? w.message : displayText(input.result.warnings[i]?.message === w.message ? input.result.warnings[i] : w, fig.unit));
  const items = warnings.map((w, i) => `<li data-warning="${i}"><span class="code">${escapeHtml(w.code)}</span> ${sentence(w, i)}</li>`).join('');
  const tomogram = (fig.get('tomogram.warnings') as { code: string; message: string }[] | undefined);
  const tomogramItems = tomogram === undefined ? '' : tomogram.length === 0 ? '<p>The tomogram raised no warning.</p>' : `<p>Raised by the tomogram:</p><ol class="warnings">${tomogram.map((w) => `<li><span class="code">${escapeHtml(w.code)}</span> ${escapeHtml(fig.unit === 'm' ? w.message : displayText(w, fig.unit))}</li>`).join('')}</ol>`;
  return `<section id="warnings"><h2><span class="no">9</span> Warnings</h2>${warnings.length === 0 ? '<p>The interpretation raised no warning.</p>' : `<p>${warnings.length} warning${warnings.length === 1 ? '' : 's'} raised by the interpretation:</p><ol class="warnings">${items}</ol>`}${tomogramItems}</section>`;
}

/** Section 10: cautions and limitations: refraction limits, estimated against measured Vs, borings, codes. */
export function cautionSection(input: ReportInput, fig: Figures): string {
  const cautions = (fig.get('cautions') as { code: string; message: string }[]) ?? [];
  const siteCautions = (fig.get('site.cautions') as { code: string; message: string }[] | undefined) ?? [];
  const site = input.result.site;
  const vs = site === undefined
    ? 'No site class is given in this report. Shear-wave velocity cannot be had from P-wave velocity alone; a site class needs measured shear-wave velocities (an SH refraction line, a downhole, crosshole or surface-wave test).'
    : site.estimated
      ? 'The shear-wave velocities in this report are ESTIMATED from P-wave velocities with an assumed Poisson’s ratio. Near the water table in particular, Vp says little about Vs: the estimate can be off by more than a class. The classes are labelled estimated and are not a measured site class; measured shear-wave velocities are needed before a class is relied on.'
      : 'The shear-wave velocities were measured on an SH refraction line. Refraction measures only layers each faster than the one above; a soft layer under a stiffer one is not seen and would make Vs30 too high.';
  const borings = 'Conditions that need borings and laboratory tests, and cannot be found by refraction: liquefiable, quick, highly sensitive or collapsible soils; peat and highly organic clay; very high plasticity clay; thick soft to medium stiff clay (ASCE 7 Site Class F, ASCE 7-16 Section 20.3.1); the soft-clay criteria of Site Class E; EN 1998-1 ground types S1 and S2; boulders, voids and weathered zones smaller than the geophone spacing; the nature of each layer (the velocities alone do not tell soil from rock or saturated soil).';
  const codes = 'This report presents a geophysical interpretation. The site class must be confirmed by the licensed professional responsible for the site under the edition of the standard the jurisdiction has adopted, and the depths against borings or test pits before a foundation is designed on them. Local codes and regulations govern.';
  const list = (items: { message: string; parts?: Caution['parts'] }[]) => items.map((c) => `<li>${escapeHtml(fig.unit === 'm' ? c.message : displayText(c, fig.unit))}</li>`).join('');
  return `<section id="cautions"><h2><span class="no">10</span> Cautions and limitations</h2>
<h3>Limits of seismic refraction</h3><ul class="cautions">${list(fig.unit === 'm' ? cautions : input.result.cautions)}</ul>
<h3>Estimated against measured shear-wave velocity</h3><p>${escapeHtml(vs)}</p>
${fig.get('tomogram') !== undefined ? `<h3>Tomogram</h3><ul class="cautions">${((fig.get('tomogram.cautions') as string[]) ?? []).map((c) => `<li>${escapeHtml(fig.unit === 'm' ? c : displayText({ message: c }, fig.unit))}</li>`).join('')}</ul>` : ''}
${siteCautions.length > 0 ? `<h3>Site class</h3><ul class="cautions">${list(fig.unit === 'm' ? siteCautions : site?.cautions ?? siteCautions)}</ul>` : ''}
<h3>Conditions that need borings</h3><p>${escapeHtml(borings)}</p>
<h3>Codes and professional practice</h3><p>${escapeHtml(codes)}</p></section>`;
}

/** Section 11: what was done, with which parameters, by which program, to which files (SHA-256). */
export function historySection(input: ReportInput, fig: Figures): string {
  const files = input.inputs.map((f) => `<tr><td class="file">${escapeHtml(f.file)}</td><td>${escapeHtml(f.role)}</td><td class="n">${f.bytes}</td><td class="hash">${escapeHtml(f.sha256)}</td></tr>`).join('');
  const history = [...input.result.history];
  if (input.document.tomogram !== undefined) {
    const t = input.document.tomogram as { grid: { nx: number; nz: number; cell_m: number }; start_model: string; stopped: string; pick_noise_ms: number; iterations: unknown[] };
    history.push({ step: 'tomography', parameters: { grid_nx: t.grid.nx, grid_nz: t.grid.nz, cell_m: t.grid.cell_m, start_model: t.start_model, iterations: t.iterations.length, stopped: t.stopped, pick_noise_ms: t.pick_noise_ms } });
  }
  const steps = history.map((s, i) => `<tr><td class="n">${i + 1}</td><td>${escapeHtml(s.step)}</td><td class="params">${Object.entries(s.parameters).map(([k, v]) => `<span>${escapeHtml(k)} = ${escapeHtml(typeof v === 'string' ? JSON.stringify(fig.sentence(v)) : JSON.stringify(v))}</span>`).join(' ')}</td></tr>`).join('');
  return `<section id="history"><h2><span class="no">11</span> Processing history</h2>
<p>Interpreted with hammerline ${escapeHtml(input.version)} on ${escapeHtml(input.issued)}. The same program version, given the same input files (checked by their SHA-256 digests) and the same command, gives the same numbers.</p>
<p class="command"><code>hammerline ${input.command.map((a) => escapeHtml(/^[\w.,:=/@+-]+$/.test(a) ? a : `'${a.replace(/'/g, "'\\''")}'`)).join(' ')}</code></p>
<table class="data files"><thead><tr><th>Input file</th><th>Role</th><th>Bytes</th><th>SHA-256</th></tr></thead><tbody>${files}</tbody></table>
<table class="data steps"><thead><tr><th>Step</th><th>Name</th><th>Parameters</th></tr></thead><tbody>${steps}</tbody></table></section>`;
}

/** The blank preparation and review block. */
export function signatureSection(): string {
  const block = (title: string) => `<div class="signature"><h3>${title}</h3><table><tbody>
<tr><th scope="row">Name</th><td></td></tr><tr><th scope="row">Signature</th><td></td></tr>
<tr><th scope="row">Date</th><td></td></tr><tr><th scope="row">Licence / registration number</th><td></td></tr></tbody></table></div>`;
  return `<section id="signatures"><h2><span class="no">12</span> Preparation and review</h2><div class="signatures">${block('Prepared by')}${block('Reviewed by')}</div></section>`;
}
