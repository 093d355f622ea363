import { fromMetres } from '../../../src/core/units.js';
import { displayText } from '../../../src/report/unitText.js';
import { el, escapeHtml, velocity } from '../format.js';
import { draw, resize, type PlotElement } from '../plotly.js';
import type { AppContext, View } from './context.js';

/**
 * The site class: vs,30 with its 5-95 % range, the class of each standard with its probability
 * (and its neighbour when borderline), the notes of each standard, and the cautions beside them
 * always. A P line gets a site class only from a Poisson's ratio the user gives (Vs estimated).
 */
export function siteView(root: HTMLElement, ctx: AppContext): View {
  const summary = el('div', { class: 'site-summary', id: 'site-summary' });
  const poisson = el('input', { id: 'site-poisson', type: 'number', min: '0', max: '0.49', step: '0.01', inputmode: 'decimal', 'aria-label': "Poisson's ratio" });
  const apply = el('button', { type: 'button', id: 'site-poisson-apply' }, 'Apply');
  const clear = el('button', { type: 'button', id: 'site-poisson-clear' }, 'Do not estimate Vs');
  const estimate = el('div', { class: 'controls', id: 'site-estimate' }, el('label', {}, "P line: estimate Vs from Vp with a Poisson's ratio of ", poisson), apply, clear);
  const plot = el('div', { class: 'plot small', id: 'site-plot' }) as PlotElement;
  const cautions = el('aside', { class: 'cautions', id: 'site-cautions' });
  const message = el('p', { class: 'problem', id: 'site-message' });
  root.append(el('div', { class: 'with-side' }, el('div', { class: 'main-column' }, estimate, message, summary, plot), cautions));
  apply.addEventListener('click', () => {
    const value = Number(poisson.value);
    if (!(poisson.value !== '' && value >= 0 && value < 0.5)) { message.textContent = `"${poisson.value}" is not a Poisson's ratio; expected a number from 0 to below 0.5.`; return; }
    message.textContent = '';
    ctx.session.setChoices({ poisson: value }, `Poisson's ratio ${value}`);
  });
  clear.addEventListener('click', () => ctx.session.setChoices({ poisson: undefined }, "no Poisson's ratio"));

  return {
    async render() {
      const line = ctx.line;
      const unit = ctx.units();
      const choice = ctx.session.project.choices.poisson;
      poisson.value = choice === undefined ? '' : String(choice);
      estimate.hidden = line?.result.wave === 'S';
      const site = line?.result.site;
      const siteWarnings = (line?.result.warnings ?? []).filter((w) => w.code.startsWith('site') || w.code === 'water-table' || w.code === 'hidden-layer-limit');
      cautions.innerHTML = `<h3>Before using this class</h3><ul>${[...(site?.cautions ?? []), ...(line?.result.cautions ?? [])].map((c) => `<li>${escapeHtml(displayText(c, unit))}</li>`).join('')}${siteWarnings.map((w) => `<li><span class="code">${escapeHtml(w.code)}</span> ${escapeHtml(displayText(w, unit))}</li>`).join('')}</ul>`;
      if (!line || !site) {
        summary.innerHTML = line
          ? `<p>No site class: ${line.result.wave === 'P' ? "this is a P-wave line. A site class needs shear-wave velocities: interpret an S-wave (SH) line, or estimate Vs from Vp with a Poisson's ratio above (an estimate, which the standards treat with caution)." : 'no station along the line has a depth to every refractor.'}</p>`
          : '<p>No interpretation yet.</p>';
        await draw(plot, [], { xaxis: { visible: false }, yaxis: { visible: false }, height: 220 });
        return;
      }
      summary.innerHTML =
        `<p class="big" id="site-vs30">v<sub>s,30</sub> = <b>${velocity(site.vs30, undefined, unit)}</b> ${site.vs30Low !== undefined && site.vs30High !== undefined ? `(5 to 95 %: ${Math.round(fromMetres(site.vs30Low, unit))} to ${Math.round(fromMetres(site.vs30High, unit))} ${unit}/s)` : '(no range: no uncertainty was given)'}${site.estimated ? `, <b>estimated${site.estimatedFromVp ? " from Vp with a Poisson's ratio" : ''}, not measured</b>` : ''}; ${site.extrapolated > 0 ? `the lowest ${fromMetres(site.extrapolated, unit).toFixed(1)} ${unit} of the averaging depth lie below the deepest refractor and take its velocity` : 'the refractors reach the averaging depth'}.</p>` +
        `<table id="site-classes"><thead><tr><th>standard</th><th>table</th><th>class</th><th>probability</th><th>average velocity over its depth</th><th>notes</th></tr></thead><tbody>` +
        site.classes.map((c) => `<tr data-standard="${escapeHtml(c.standard)}"><td>${escapeHtml(c.standard)}</td><td>${escapeHtml(c.table)}</td><td class="class">${escapeHtml(c.class)}${c.basis === 'profile shape' ? ' (profile shape)' : ''}${c.classByEstimate && c.classByEstimate !== c.class ? `<br><small>the estimate falls in ${escapeHtml(c.classByEstimate)}${c.measuredOnlyClause ? `; ${escapeHtml(c.measuredOnlyClause)}` : ''}</small>` : ''}</td><td>${c.probability === undefined ? '–' : `${Math.round(c.probability * 100)} %`}${c.borderline && c.neighbour ? ` (borderline: ${escapeHtml(c.neighbour)} ${Math.round((c.probabilities[c.neighbour] ?? 0) * 100)} %)` : ''}</td><td>${velocity(c.averageVelocity, undefined, unit)} over ${fromMetres(c.averagingDepth, unit).toFixed(0)} ${unit}</td><td>${[...(c.estimatedRange ? [`estimated velocities: classes ${escapeHtml(c.estimatedRange.low.class)} / ${escapeHtml(c.estimatedRange.central.class)} / ${escapeHtml(c.estimatedRange.high.class)} at v̄s ÷ ${c.estimatedRange.factor}, v̄s, × ${c.estimatedRange.factor}`] : []), ...(c.noteTexts ?? c.notes.map((text) => ({ text, parts: [text] }))).map((t) => escapeHtml(displayText(t, unit)))].join('<br>')}</td></tr>`).join('') +
        `</tbody></table><p class="hint">Monte Carlo of ${site.draws} draws (seed ${site.seed}) over the layer velocities, the refractor depths and the stations along the line.</p>`;
      await draw(plot, [{ type: 'scatter', mode: 'lines+markers', name: 'vs,30 at each station', x: site.alongLine.map((s) => fromMetres(s.x, unit)), y: site.alongLine.map((s) => fromMetres(s.vs30, unit)), line: { color: '#3f7f6b' }, marker: { size: 4 } }],
        { title: { text: 'v<sub>s,30</sub> along the line', font: { size: 13 } }, height: 240, xaxis: { title: { text: `position (${unit})` } }, yaxis: { title: { text: `${unit}/s` } }, showlegend: false, uirevision: unit });
    },
    resize: () => resize(plot),
  };
}
