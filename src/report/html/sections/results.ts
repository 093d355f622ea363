import { hiddenLayerText } from '../../../core/cautions.js';
import { displayText } from '../../unitText.js';
import { escapeHtml } from '../escape.js';
import type { Figures } from '../figures.js';
import { findStep, parameter } from '../references.js';
import { depthSectionSvg, METHOD_DASH, REFRACTOR_COLOURS } from '../svg/depthSection.js';
import { timeDistanceSvg } from '../svg/timeDistance.js';
import { tomogramSvg, type TomogramDocument } from '../svg/tomogram.js';
import type { ReportInput } from '../types.js';

const DEPTH_METHODS = ['plus-minus', 'GRM', 'delay-time'];

/** Section 3: the time-distance plot with the fitted segments. */
export function timeDistanceSection(input: ReportInput, fig: Figures): string {
  const { svg, series } = timeDistanceSvg(input.result.fits, fig.unit);
  const legend = series.map((s) => `<span class="key"><svg viewBox="0 0 14 8" class="swatch"><line x1="0" y1="4" x2="14" y2="4" stroke="${s.colour}" stroke-width="1.6"/><circle cx="7" cy="4" r="2" fill="${s.colour}"/></svg>${escapeHtml(s.sourceId)} (x = ${fig.plain('length', s.sourceX, 2)})</span>`).join('');
  return `<section id="time-distance"><h2><span class="no">3</span> Time-distance plot</h2>
<figure>${svg}<figcaption><span class="legend">${legend}<span class="key"><svg viewBox="0 0 14 8" class="swatch"><path d="M4 1L10 7M4 7L10 1" stroke="#333" stroke-width="1.2"/></svg>pick left out of the fit</span><span class="key"><svg viewBox="0 0 14 8" class="swatch"><path d="M7 1l-4 7h8z" fill="#333"/></svg>source position</span></span>
Figure 1. First-break times against position along the line, one colour per source; the lines are the fitted segments of each branch (time = intercept time + offset / apparent velocity), drawn over the offsets of the picks they fit.</figcaption></figure></section>`;
}

/** Section 4: the depth section with uncertainty bands, each method, the recommended profile heavy. */
export function depthSectionSection(input: ReportInput, fig: Figures): string {
  const result = input.result;
  const sources = [...new Map(result.fits.map((f) => [f.branch.sourceId, { id: f.branch.sourceId, x: f.branch.sourceX, elev: f.branch.sourceElev }])).values()].sort((a, b) => a.x - b.x);
  const layerLabels = result.layers.slice(0, result.refractors.length + 1).map((l, i) => `<tspan>${result.wave === 'S' ? 'Vs' : 'Vp'} ${fig.pm(`layers.${i}.velocity_mps`, `layers.${i}.velocity_se_mps`, 0).replace(/<span /g, '<tspan ').replace(/<\/span>/g, '</tspan>')} ${fig.velocityLabel}</tspan>`);
  const { svg, exaggeration } = depthSectionSvg({ receivers: input.receivers, sources, refractors: result.refractors, layerLabels, unit: fig.unit });
  const keys = result.refractors.map((r, k) => `<span class="key"><svg viewBox="0 0 20 8" class="swatch"><rect x="0" y="1" width="20" height="6" fill="${REFRACTOR_COLOURS[k % REFRACTOR_COLOURS.length]}" fill-opacity="0.2"/><line x1="0" y1="4" x2="20" y2="4" stroke="${REFRACTOR_COLOURS[k % REFRACTOR_COLOURS.length]}" stroke-width="2"/></svg>refractor ${r.index}, recommended (${escapeHtml(r.method)}) ± 1 standard error</span>`).join('') + (result.refractors.some((r) => r.pointMethods.includes('interpolated')) ? '<span class="key"><svg viewBox="0 0 20 8" class="swatch"><line x1="0" y1="4" x2="20" y2="4" stroke="#777" stroke-width="2.2"/><line x1="0" y1="4" x2="20" y2="4" stroke="#fff" stroke-width="1" stroke-dasharray="3 3"/></svg>interpolated across a gap in coverage</span>' : '');
  const methodKeys = DEPTH_METHODS.map((m) => `<span class="key"><svg viewBox="0 0 20 8" class="swatch"><line x1="0" y1="4" x2="20" y2="4" stroke="#444" stroke-width="1" stroke-dasharray="${METHOD_DASH[m]}"/></svg>${escapeHtml(m)}</span>`).join('');
  const tomogram = fig.get('tomogram') === undefined ? '' : tomogramFigure(input, fig);
  return `<section id="depth-section"><h2><span class="no">4</span> Depth section</h2>
<figure>${svg}<figcaption><span class="legend"><span class="key"><svg viewBox="0 0 20 8" class="swatch"><line x1="0" y1="4" x2="20" y2="4" stroke="#111" stroke-width="1.6"/></svg>ground surface, geophones</span>${keys}${methodKeys}<span class="key"><svg viewBox="0 0 14 10" class="swatch"><path d="M7 1l4 4l-4 4l-4 -4z" fill="none" stroke="#444"/></svg>intercept-time depth under a source</span></span>
Figure 2. Interpreted section along the line. Vertical exaggeration ${exaggeration.toFixed(1)} : 1. Bands are ± one standard error of the recommended depth; layer velocities are true velocities ± one standard error. Depths are vertical, below the ground at each geophone.</figcaption></figure>${tomogram}</section>`;
}

/** Section 5: layer velocities ± standard error, dips and thickness ranges. */
export function layerSection(input: ReportInput, fig: Figures): string {
  const result = input.result;
  const rows = result.layers.map((l, i) => {
    const isLast = i === result.refractors.length;
    const below = i > result.refractors.length;
    const hasBase = i < result.refractors.length && result.refractors[i].points.length > 0;
    const thickness = isLast ? 'below the deepest refractor' : below ? 'no depth computed (below a velocity inversion)' : hasBase ? `${fig.thickness(i + 1, 'min', 1)} to ${fig.thickness(i + 1, 'max', 1)}` : '—';
    return `<tr><td>${l.index}</td><td class="n">${fig.pm(`layers.${i}.velocity_mps`, `layers.${i}.velocity_se_mps`, 0)}</td><td class="n">${l.index === 1 ? 'surface' : fig.get(`layers.${i}.dip_deg`) === null ? 'unknown' : fig.pm(`layers.${i}.dip_deg`, `layers.${i}.dip_se_deg`, 1)}</td><td>${l.reversed ? 'forward and reverse' : 'one side only (apparent velocity)'}</td><td class="n">${thickness}</td></tr>`;
  }).join('');
  return `<section id="layers"><h2><span class="no">5</span> Layers</h2>
<table class="data"><thead><tr><th>Layer</th><th>${result.wave === 'S' ? 'Vs' : 'Vp'} ± standard error (${fig.velocityLabel})</th><th>Dip of its top (degrees)</th><th>Velocity seen by</th><th>Thickness along the line (${fig.lengthLabel})</th></tr></thead><tbody>${rows}</tbody></table>
<p class="note">Dip is positive where the top of the layer deepens towards increasing x. Thickness is the range along the line of the difference between the recommended depths of the refractors above and below the layer.</p></section>`;
}

/** Section 6: depth to each refractor at every geophone, by method and recommended; intercept-time depths under the sources. */
export function depthTableSection(input: ReportInput, fig: Figures): string {
  const result = input.result;
  const tables = result.refractors.map((r, k) => {
    const path = `refractors.${k}`;
    const methods = DEPTH_METHODS.filter((m) => (r.byMethod[m] ?? []).length > 0);
    const indexOf = (m: string) => new Map((r.byMethod[m] ?? []).map((p, i) => [p.x, i]));
    const methodIndex = new Map(methods.map((m) => [m, indexOf(m)]));
    const pointIndex = new Map(r.points.map((p, i) => [p.x, i]));
    const rows = input.receivers.map((receiver, n) => {
      const i = pointIndex.get(receiver.x);
      const rec = i === undefined ? '<td class="n">—</td><td class="n">—</td><td>—</td>' : `<td class="n rec">${fig.pm(`${path}.points.${i}.depth_m`, `${path}.points.${i}.depth_se_m`, 2)}</td><td class="n">${fig.num(`${path}.points.${i}.elev_m`, 2)}</td><td class="tight">${fig.text(`${path}.points.${i}.method`)}</td>`;
      const others = methods.map((m) => {
        const j = methodIndex.get(m)!.get(receiver.x);
        return `<td class="n">${j === undefined ? '—' : fig.num(`${path}.by_method.${m}.${j}.depth_m`, 2)}</td>`;
      }).join('');
      return `<tr><td class="n">${fig.num(`layout.receivers.${n}.station`, 0)}</td><td class="n">${fig.num(`layout.receivers.${n}.x_m`, 2)}</td><td class="n">${fig.num(`layout.receivers.${n}.elev_m`, 2)}</td>${rec}${others}</tr>`;
    }).join('');
    const intercept = r.byMethod['intercept-time'] ?? [];
    const interceptText = intercept.length === 0 ? '' : `<p class="note">Intercept-time depths under the sources: ${intercept.map((p, i) => `${escapeHtml(p.sourceId ?? '')} at x = ${fig.withUnit('length', () => fig.num(`${path}.by_method.intercept-time.${i}.x_m`, 2))}: ${fig.withUnit('length', () => fig.pm(`${path}.by_method.intercept-time.${i}.depth_m`, `${path}.by_method.intercept-time.${i}.depth_se_m`, 2))}`).join('; ')}.</p>`;
    const qualifying = result.warnings.filter((w) => w.layer === r.index + 1);
    const limit = r.hiddenLayer ? [`Hidden-layer limit: ${fig.unit === 'm' ? hiddenLayerText(r).text : displayText(hiddenLayerText(r), fig.unit)}`] : [];
    const lines = [...limit, ...qualifying.map((w) => (fig.unit === 'm' ? w.message : displayText(w, fig.unit)))];
    const cautions = lines.length === 0 ? '' : `<ul class="qualifiers">${lines.map((line) => `<li>${escapeHtml(line)}</li>`).join('')}</ul>`;
    const u = fig.lengthLabel;
    return `<h3>Refractor ${r.index}: top of layer ${r.index + 1} (${fig.withUnit('velocity', () => fig.num(`layers.${r.index}.velocity_mps`, 0))}); recommended: ${escapeHtml(r.method)}</h3>
<table class="data depths"><thead><tr><th>Station</th><th>x (${u})</th><th>Ground elevation (${u})</th><th>Recommended depth ± SE (${u})</th><th>Refractor elevation (${u})</th><th>Method</th>${methods.map((m) => `<th>${escapeHtml(m)} depth (${u})</th>`).join('')}</tr></thead><tbody>${rows}</tbody></table>${interceptText}${cautions}`;
  }).join('');
  const none = result.refractors.length === 0 ? '<p>No refractor was found, so no depth is reported.</p>' : '';
  return `<section id="depths"><h2><span class="no">6</span> Depth to each refractor</h2>
<p class="note">Depth is vertical, below the ground at each geophone; SE is one standard error.${fig.unit === 'ft' ? ' Lengths in feet (1 ft = 0.3048 m exactly).' : ''} A dash means the method gives no depth there. These depths are interpretations to be confirmed by borings before a foundation is designed on them (section 10).</p>${none}${tables}</section>`;
}

/** Section 7: Vs30 with its range, and each standard's class with its probability; estimated values labelled. */
export function siteSection(input: ReportInput, fig: Figures): string {
  const site = input.result.site;
  if (site === undefined) {
    return `<section id="site"><h2><span class="no">7</span> Vs30 and site class</h2><p>Not assessed. ${input.result.wave === 'P' ? 'A P-wave line does not give shear-wave velocities. A site class needs an S-wave (SH) line over the same ground, a downhole or crosshole test, or, as an estimate only, an assumed Poisson’s ratio for each layer.' : 'No station along the line has a depth to every refractor, so no profile could be averaged.'}</p></section>`;
  }
  const basis = site.estimatedFromVp
    ? `<p class="estimated"><strong>ESTIMATED, not measured.</strong> The shear-wave velocities were derived from the P-wave velocities with an assumed Poisson’s ratio (${(parameter(findStep(input.result.history, 'site'), 'poisson') as number[] | null | undefined)?.join(', ') ?? 'as given'}, layers top down). A site class from Vp is an estimate: it is not a measured site class, and the standards’ rules for estimated velocities apply.</p>`
    : site.estimated ? '<p class="estimated"><strong>ESTIMATED.</strong> The velocities were entered as estimates.</p>' : '<p>Shear-wave velocities measured on this S-wave line (first breaks of horizontally polarised shear waves).</p>';
  const rows = site.classes.map((c, i) => {
    const p = `site.classes.${i}`;
    const notes = [c.borderline ? `borderline: ${escapeHtml(c.neighbour ?? 'another class')} possible` : '', c.basis === 'profile shape' ? `by profile shape (by velocity alone: ${escapeHtml(c.velocityClass ?? '')})` : '', c.estimatedRange ? `v̄s/1.3, v̄s, 1.3 v̄s give ${escapeHtml(c.estimatedRange.low.class)}, ${escapeHtml(c.estimatedRange.central.class)}, ${escapeHtml(c.estimatedRange.high.class)}; the most critical governs` : ''].filter(Boolean).join('; ');
    return `<tr><td class="tight">${escapeHtml(c.standard)}</td><td class="tight">${escapeHtml(c.table)}</td><td class="n">${fig.num(`${p}.average_velocity_mps`, 0)}</td><td class="n">${fig.num(`${p}.averaging_depth_m`, 2)}</td><td class="cls">${escapeHtml(c.class)}${site.estimated ? ' (estimated)' : ''}</td><td class="n">${fig.num(`${p}.probability`, 2)}</td><td>${notes || '—'}</td></tr>`;
  }).join('');
  const notes = site.classes.flatMap((c) => (fig.unit === 'm' ? c.notes : c.noteTexts ?? c.notes).map((n) => `<li>${escapeHtml(c.standard)}: ${escapeHtml(typeof n === 'string' ? (fig.unit === 'm' ? n : displayText({ message: n }, fig.unit)) : displayText(n, fig.unit))}</li>`)).join('');
  return `<section id="site"><h2><span class="no">7</span> Vs30 and site class${site.estimated ? ' (estimated)' : ''}</h2>${basis}
<table class="data kv"><tbody>
<tr><th scope="row">Vs30${site.estimated ? ' (estimated)' : ''}, time-averaged over the top ${fig.plain('length', 30, 0)}</th><td class="n">${fig.withUnit('velocity', () => fig.num('site.vs30_mps', 0))}</td></tr>
<tr><th scope="row">5th to 95th percentile (${fig.num('site.monte_carlo.draws', 0)} Monte Carlo draws, seed ${fig.num('site.monte_carlo.seed', 0)})</th><td class="n">${fig.withUnit('velocity', () => `${fig.num('site.vs30_low_mps', 0)} to ${fig.num('site.vs30_high_mps', 0)}`)}</td></tr>
<tr><th scope="row">Along the line (${fig.num('site.along_line.length', 0)} stations)</th><td class="n">${fig.withUnit('velocity', () => `${fig.num('site.along_line_min_mps', 0)} to ${fig.num('site.along_line_max_mps', 0)}`)}</td></tr>
<tr><th scope="row">Of the top ${fig.plain('length', 30, 0)}, extrapolated below the deepest refractor</th><td class="n">${fig.withUnit('length', () => fig.num('site.extrapolated_m', 1))}</td></tr>
</tbody></table>
<table class="data"><thead><tr><th>Standard</th><th>Table</th><th>v̄s (${fig.velocityLabel})</th><th>Averaged over (${fig.lengthLabel})</th><th>Class</th><th>Probability</th><th>Remarks</th></tr></thead><tbody>${rows}</tbody></table>
<p class="note">v̄s is averaged over each standard’s own depth (${fig.unit === 'ft' ? '100 ft [30.48 m] for ASCE 7, 98.4 ft [30 m] for EN 1998-1' : '30 m, or 100 ft = 30.48 m for ASCE 7'}). Probability is the share of Monte Carlo draws (velocities and depths drawn from their standard errors, a station drawn along the line) that give the class shown. A value on a class bound is given to the softer class.</p>
${notes ? `<ul class="qualifiers">${notes}</ul>` : ''}${pLineCheck(fig)}</section>`;
}

/** Figure 3, when a tomogram was made: the velocity grid, its contours, the layered refractors for comparison. */
function tomogramFigure(input: ReportInput, fig: Figures): string {
  const t = fig.get('tomogram') as TomogramDocument & { iterations: unknown[]; contours: { velocity_mps: number }[] };
  const refractors = input.result.refractors.map((r) => r.points.map((p) => ({ x: p.x, elev: p.elev })));
  const { svg, bands, exaggeration } = tomogramSvg(t, input.receivers, refractors, fig.unit);
  const last = t.iterations.length - 1;
  const scale = bands.map((b) => `<span class="key"><svg viewBox="0 0 10 8" class="swatch"><rect x="0" y="0" width="10" height="8" fill="${b.colour}"/></svg>${b.low}–${b.high}</span>`).join('');
  const rows = t.contours.map((contour, i) => `<tr><td class="n">${fig.num(`tomogram.contours.${i}.velocity_mps`, 0)}</td><td class="n">${fig.agg(`tomogram.contours.${i}.points`, 'depth_m', 'min', 1)} to ${fig.agg(`tomogram.contours.${i}.points`, 'depth_m', 'max', 1)}</td><td class="n">${fig.agg(`tomogram.contours.${i}.points`, 'layered_depth_m', 'min', 1)} to ${fig.agg(`tomogram.contours.${i}.points`, 'layered_depth_m', 'max', 1)}</td></tr>`).join('');
  const table = t.contours.length === 0 ? '' : `<table class="data"><thead><tr><th>Contour (${fig.velocityLabel})</th><th>Contour depth below ground (${fig.lengthLabel})</th><th>Layered depth below ground at the same geophones (${fig.lengthLabel})</th></tr></thead><tbody>${rows}</tbody></table>`;
  return `<figure class="tomogram">${svg}<figcaption><span class="legend">${scale}<span class="key">${fig.velocityLabel}</span><span class="key"><svg viewBox="0 0 20 8" class="swatch"><line x1="0" y1="4" x2="20" y2="4" stroke="#111" stroke-width="1.4"/></svg>velocity contour</span><span class="key"><svg viewBox="0 0 20 8" class="swatch"><line x1="0" y1="4" x2="20" y2="4" stroke="#111" stroke-width="1" stroke-dasharray="4 2"/></svg>layered refractor (recommended)</span></span>
Figure 3. First-arrival traveltime tomogram of the same first breaks, a second opinion beside the layered section and not mixed into it: ${escapeHtml(fig.sentence(String(fig.get('tomogram.start_model') ?? '')))}; ${fig.num(`tomogram.iterations.${last}.iteration`, 0)} iterations, RMS misfit ${fig.num(`tomogram.iterations.${last}.rms_ms`, 2)} ms against a pick noise of ${fig.num('tomogram.pick_noise_ms', 2)} ms. Cells no first break samples are blank. Vertical exaggeration ${exaggeration.toFixed(1)} : 1. Contours are drawn at the velocities midway (geometric mean) between consecutive layer velocities; the cautions on tomograms are in section 10.</figcaption></figure>${table}`;
}

/** The check of the shear-wave layers against the P-wave line over the same ground, when one was given. */
function pLineCheck(fig: Figures): string {
  const check = fig.get('p_line_check') as { file: string; layers: { plausible: boolean; range_basis: string }[] } | undefined;
  if (check === undefined) return '';
  const rows = check.layers.map((l, i) => {
    const p = `p_line_check.layers.${i}`;
    return `<tr><td class="n">${fig.num(`${p}.layer`, 0)}</td><td class="n">${fig.num(`${p}.top_m`, 1)} to ${fig.get(`${p}.bottom_m`) === null ? 'below' : fig.num(`${p}.bottom_m`, 1)}</td><td class="n">${fig.num(`${p}.vs_mps`, 0)}</td><td class="n">${fig.num(`${p}.vp_mps`, 0)}</td><td class="n">${fig.num(`${p}.vp_vs`, 2)}</td><td>${l.plausible ? 'plausible' : '<strong>implausible</strong>'}: ${escapeHtml(fig.unit === 'm' ? l.range_basis : displayText({ message: l.range_basis }, fig.unit))}</td></tr>`;
  }).join('');
  return `<h3>Shear-wave velocities checked against the P-wave line</h3><p>P-wave line over the same ground: ${escapeHtml(check.file)}. Vs must be lower than Vp in the same material (Vp/Vs at least √2 by elasticity).</p>
<table class="data"><thead><tr><th>Layer</th><th>Depth (${fig.lengthLabel})</th><th>Vs (${fig.velocityLabel})</th><th>Vp (${fig.velocityLabel})</th><th>Vp/Vs</th><th>Check</th></tr></thead><tbody>${rows}</tbody></table>`;
}
