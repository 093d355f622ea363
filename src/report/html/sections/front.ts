import { LEFT_OUT, WATER_TABLE_VP_MAX, WATER_TABLE_VP_MIN } from '../../../core/cautions.js';
import { JOB_FIELDS } from '../../../io/jobDetails.js';
import { escapeHtml } from '../escape.js';
import type { Figures } from '../figures.js';
import { methodReferences } from '../references.js';
import type { ReportInput } from '../types.js';

interface DocRefractor { index: number; velocity_mps: number | null; method: string; points: { x_m: number; depth_m: number }[] }
interface DocWarning { code: string; message: string; layer?: number }

/** The title block and the job details, with the details a reviewer expects that are missing. */
export function jobSection(input: ReportInput, fig: Figures): string {
  const job = input.job;
  const rows = JOB_FIELDS.map((field) => {
    const value = job[field.property];
    let shown: string;
    if (value === undefined) shown = '<span class="missing">not given</span>';
    else if (typeof value === 'object') shown = `${Math.abs(value.lat).toFixed(7)}° ${value.lat < 0 ? 'S' : 'N'}, ${Math.abs(value.lon).toFixed(7)}° ${value.lon < 0 ? 'W' : 'E'} <span class="unit">(longitude ${value.lon}, latitude ${value.lat})</span>`;
    else if (typeof value === 'number') shown = fig.plain('length', value, 2);
    else shown = escapeHtml(value);
    if (value === undefined && !field.expected) return '';
    return `<tr><th scope="row">${escapeHtml(field.label)}</th><td>${shown}</td></tr>`;
  }).join('');
  const missing = input.missing.length === 0 ? '' : `<p class="notice"><strong>Details a reviewer would expect that were not supplied:</strong> ${input.missing.map(escapeHtml).join('; ')}.</p>`;
  const notices = input.notices.map((n) => `<p class="notice">${escapeHtml(n)}</p>`).join('');
  const title = job.line ? `Seismic refraction survey, line ${escapeHtml(job.line)}` : 'Seismic refraction survey';
  return `<header class="title-block">
<p class="kicker">Geophysical site investigation report</p>
<h1>${title}</h1>
${job.site ? `<p class="subtitle">${escapeHtml(job.site)}</p>` : ''}
<table class="job"><tbody>${rows}<tr><th scope="row">Report issued</th><td>${escapeHtml(input.issued)}</td></tr><tr><th scope="row">Interpretation</th><td>hammerline ${escapeHtml(input.version)}, ${escapeHtml(input.result.wave)}-wave line</td></tr></tbody></table>
${missing}${notices}
</header>`;
}

/** Section 1: depths, water table, Vs30 and classes, and the three main limitations. */
export function summarySection(input: ReportInput, fig: Figures): string {
  const refractors = (fig.get('refractors') as DocRefractor[]) ?? [];
  const warnings = (fig.get('warnings') as DocWarning[]) ?? [];
  const wave = input.result.wave;
  const items: string[] = [];
  const waterRefractors = new Set(warnings.filter((w) => w.code === 'water-table' && w.layer !== undefined).map((w) => w.layer! - 1));
  refractors.forEach((r, k) => {
    const path = `refractors.${k}`;
    if (r.points.length === 0) {
      items.push(`<li>Refractor ${r.index} (${fig.withUnit('velocity', () => fig.num(`${path}.velocity_mps`, 0))}): no method gives a depth.</li>`);
      return;
    }
    const range = `${fig.withUnit('length', () => `${fig.agg(`${path}.points`, 'depth_m', 'min', 1)} to ${fig.agg(`${path}.points`, 'depth_m', 'max', 1)}`)} below ground (elevation ${fig.withUnit('length', () => `${fig.agg(`${path}.points`, 'elev_m', 'min', 1)} to ${fig.agg(`${path}.points`, 'elev_m', 'max', 1)}`)})`;
    const deepest = k === refractors.length - 1;
    let role = '';
    if (waterRefractors.has(r.index)) role = `, within the band of saturated soil (${fig.plain('velocity', [WATER_TABLE_VP_MIN, WATER_TABLE_VP_MAX], 0, '–')}): <strong>possibly the water table rather than rock</strong>`;
    else if (deepest) role = ': <strong>probable rock head</strong>, on velocity alone, to be confirmed by borings';
    items.push(`<li>Refractor ${r.index} (${wave === 'S' ? 'Vs' : 'Vp'} ${fig.withUnit('velocity', () => fig.pm(`layers.${r.index}.velocity_mps`, `layers.${r.index}.velocity_se_mps`, 0))}): ${range}${role}.</li>`);
  });
  if (refractors.length === 0) {
    items.push(warnings.some((w) => LEFT_OUT.has(w.code))
      ? '<li>No refractor with depths: later arrivals were seen, but none gives a refractor whose depth can be computed (see the warnings), so no depth can be reported.</li>'
      : '<li>No refractor was found: the first breaks fit the direct wave alone, so no depth can be reported.</li>');
  }
  if (wave === 'P' && waterRefractors.size === 0) items.push(`<li>Water table: no refractor in the band of saturated soil (${fig.plain('velocity', [WATER_TABLE_VP_MIN, WATER_TABLE_VP_MAX], 0, '–')}) was seen; a water table inside a layer, or below the deepest refractor, would not show.</li>`);
  if (wave === 'S') items.push('<li>Water table: shear waves are not sped up by pore water, so an S-wave line does not show it.</li>');
  const site = fig.get('site') as { estimated: boolean; classes: { standard: string; class: string; borderline: boolean; neighbour?: string }[] } | undefined;
  if (site) {
    const label = site.estimated ? ' <strong>(ESTIMATED from Vp, not measured)</strong>' : ' (from measured shear-wave velocities)';
    items.push(`<li>Vs30 ${fig.withUnit('velocity', () => fig.num('site.vs30_mps', 0))}, 5th–95th percentile ${fig.withUnit('velocity', () => `${fig.num('site.vs30_low_mps', 0)} to ${fig.num('site.vs30_high_mps', 0)}`)}${label}. Site class: ${site.classes.map((c, i) => `<span class="tight">${escapeHtml(c.standard)}</span> <strong>${escapeHtml(c.class)}${site.estimated ? ' (estimated)' : ''}</strong> (probability ${fig.num(`site.classes.${i}.probability`, 2)}${c.borderline ? `, borderline: ${escapeHtml(c.neighbour ?? 'another class')} possible` : ''})`).join('; ')}.</li>`);
  } else {
    items.push(`<li>Site class: not assessed. ${wave === 'P' ? 'Shear-wave velocities cannot be had from a P-wave line alone; an S-wave line, or an assumed Poisson’s ratio (an estimate), is needed.' : 'No station along the line has a depth to every refractor.'}</li>`);
  }
  const limits = mainLimitations(input, fig, warnings, Boolean(site?.estimated));
  return `<section id="summary"><h2><span class="no">1</span> Summary</h2><ul class="summary">${items.join('')}</ul>
<div class="limits"><h3>Main limitations</h3><ol>${limits.map((l) => `<li>${l}</li>`).join('')}</ol></div></section>`;
}

/** Three sentences: what refraction cannot see here, how sure the site class is, what must confirm the result. */
function mainLimitations(input: ReportInput, fig: Figures, warnings: DocWarning[], estimated: boolean): string[] {
  const warned = warnings.some((w) => w.code === 'hidden-layer-limit'); // raised only where the fit left out a segment
  const deepest = [...input.result.refractors].reverse().find((r) => r.hiddenLayer !== undefined);
  const first = warned
    ? `A hidden layer or a velocity inversion would not be seen, and here the fit shows signs of a layer it did not keep: a hidden layer could make the refractors deeper than shown (section 9).`
    : deepest !== undefined
      ? `A hidden layer or a velocity inversion would not be seen: a layer thin enough to stay hidden could make refractor ${deepest.index} up to ${fig.plain('length', deepest.hiddenLayer!.depthUnderestimate, 1)} deeper than shown (section 6).`
    : 'A hidden layer or a velocity inversion would not be seen, and would make the depths too shallow or too deep.';
  const second = input.result.site === undefined
    ? 'No site class is given; one needs shear-wave velocities, measured on an S-wave line or in a borehole.'
    : estimated
      ? 'The shear-wave velocities, and so Vs30 and the site classes, are estimated from P-wave velocities with an assumed Poisson’s ratio; they are not a measured site class.'
      : `Vs30 rests on a layered interpretation extended below the deepest refractor where the line does not reach ${fig.plain('length', 30, 0)}; a soft layer under a stiffer one would make it too high.`;
  return [escapeHtml(first), escapeHtml(second), escapeHtml('Depths and classes are to be confirmed by borings or test pits and by the licensed professional responsible for the site, under the codes the jurisdiction has adopted.')];
}

/** Section 2: the field layout as the data show it, and every method used with its published reference. */
export function methodSection(input: ReportInput, fig: Figures): string {
  const history = input.result.history;
  const sources = (fig.get('layout.sources') as { id: string }[] | undefined) ?? [];
  const picked = fig.get('picking') !== undefined;
  const bandPass = input.command.some((a) => a.startsWith('--bandpass'));
  const site = input.result.site;
  const refs = methodReferences(history, { picked, bandPass, extrapolated: (site?.extrapolated ?? 0) > 0, estimatedFromVp: site?.estimatedFromVp ?? false, tomogram: fig.get('tomogram') !== undefined, depthMethodsWithDepths: new Set(input.result.refractors.flatMap((r) => Object.entries(r.byMethod).filter(([, points]) => points.length > 0).map(([m]) => m))) });
  const layout = `<p>${input.result.wave === 'S' ? 'Horizontally polarised shear (SH) waves' : 'Compressional (P) waves'} were recorded on ${fig.num('layout.geophones', 0)} geophones from x = ${fig.withUnit('length', () => fig.num('layout.first_x_m', 2))} to x = ${fig.withUnit('length', () => fig.num('layout.last_x_m', 2))} at a median spacing of ${fig.withUnit('length', () => fig.num('layout.spacing_m', 2))}, from ${fig.num('layout.source_count', 0)} source positions (${sources.map((s, i) => `${escapeHtml(s.id)} at ${fig.withUnit('length', () => fig.num(`layout.sources.${i}.x_m`, 2))}`).join(', ')}). ${picked ? `The first breaks were picked automatically from ${fig.num('picking.traces', 0)} traces of the SEG-2 records (${fig.num('picking.picked', 0)} picked).` : 'The first breaks were supplied as a table of picks.'} ${input.hasElevations ? 'Ground elevations are those supplied with the data.' : '<strong>No ground elevations were supplied: the ground is taken as flat</strong>, and elevations are relative.'}</p>
<p>The first breaks of each source were split into branches (one per side of the source) and each branch was fitted with straight-line segments; the segments were assigned to layers, and true layer velocities and refractor dips were computed from the forward and reverse branches. Depths below each geophone were computed by each of the methods below; the recommended profile is stated for every refractor in section 6. The interpreted section was checked by computing first arrivals through it (least travel time over the refractors, Fermat’s principle) and comparing them with the picks (section 8).</p>`;
  const rows = refs.map((r) => `<tr><td>${escapeHtml(fig.sentence(r.method))}</td><td>${escapeHtml(fig.sentence(r.purpose))}</td><td>${r.references.length === 0 ? '—' : r.references.map(escapeHtml).join('<br>')}</td></tr>`).join('');
  return `<section id="method"><h2><span class="no">2</span> Method statement</h2>${layout}
<table class="methods"><thead><tr><th>Method</th><th>Used for</th><th>Reference</th></tr></thead><tbody>${rows}</tbody></table></section>`;
}
