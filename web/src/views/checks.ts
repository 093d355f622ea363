import type { Warning } from '../../../src/core/warnings.js';
import { fromMetres } from '../../../src/core/units.js';
import { el, escapeHtml } from '../format.js';
import { draw, resize, type PlotData, type PlotElement } from '../plotly.js';
import type { AppContext, Focus, TabName, View } from './context.js';

const PALETTE = ['#3f7f6b', '#d08c2f', '#5b5ea6', '#a34d5d', '#2f6d9e', '#7a6a2f', '#8a4f9e', '#4f8a2f'];

/** Where a warning is best seen: the view and what to bring forward there. */
export function warningTarget(w: Warning, records: string[]): { tab: TabName; focus: Focus; label: string } {
  if (w.where?.trace !== undefined && w.where.file) return { tab: 'records', focus: { record: w.where.file, trace: w.where.trace }, label: `${w.where.file}, trace ${w.where.trace}` };
  if (w.code === 'unpicked-traces') {
    const record = records.find((r) => w.message.startsWith(`${r}:`));
    return { tab: 'records', focus: { record }, label: record ?? 'shot records' };
  }
  if (w.code === 'reciprocal-time') return { tab: 'checks', focus: { anchor: 'reciprocal' }, label: 'reciprocal times' };
  if (w.code === 'forward-misfit') return { tab: 'checks', focus: { anchor: 'residuals' }, label: 'forward residuals' };
  if (w.code.startsWith('site')) return { tab: 'site', focus: {}, label: 'site class' };
  if (w.where?.source) return { tab: 'traveltime', focus: { source: w.where.source }, label: `source ${w.where.source}` };
  const source = /\bsource (\S+?)[ ,:;]/.exec(w.message)?.[1];
  if (['hidden-layer-limit', 'water-table', 'methods-disagree', 'interpolated-depths', 'not-covered', 'intercept-depth', 'receiver-gap', 'no-reversed-pair'].includes(w.code) || (w.layer !== undefined && !source)) return { tab: 'section', focus: { layer: w.layer }, label: w.layer ? `section, refractor or layer ${w.layer}` : 'section' };
  return { tab: 'traveltime', focus: { source }, label: source ? `source ${source}` : 'time–distance' };
}

/**
 * The checks: reciprocal times of every reversed pair, the residuals of every pick against the
 * first arrivals computed through the section (by source), and every warning, each with a link
 * to the view it concerns.
 */
export function checksView(root: HTMLElement, ctx: AppContext): View {
  const reciprocal = el('section', { id: 'reciprocal' });
  const plot = el('div', { class: 'plot small', id: 'residuals' }) as PlotElement;
  const warnings = el('section', { id: 'warnings' });
  root.append(reciprocal, el('h3', {}, 'Forward check'), plot, warnings);
  warnings.addEventListener('click', (event) => {
    const button = (event.target as HTMLElement).closest('button[data-warning]');
    if (!button || !ctx.line) return;
    const w = ctx.line.result.warnings[Number(button.getAttribute('data-warning'))];
    const target = warningTarget(w, ctx.session.project.inputs.filter((i) => i.kind === 'seg2').map((i) => i.name));
    ctx.show(target.tab, target.focus);
  });

  return {
    async render() {
      const line = ctx.line;
      if (!line) { await draw(plot, [], {}); return; }
      const unit = ctx.units();
      const result = line.result;
      reciprocal.innerHTML = `<h3>Reciprocal times</h3>` + (result.reciprocal.length === 0 ? '<p>No pair of sources whose branches reach each other.</p>' :
        `<table><thead><tr><th>sources</th><th>A at B (ms)</th><th>B at A (ms)</th><th>difference (ms)</th><th>tolerance (ms)</th><th></th></tr></thead><tbody>${result.reciprocal.map((c) => `<tr class="${c.ok ? '' : 'problem'}"><td>${escapeHtml(c.sourceA)} – ${escapeHtml(c.sourceB)}</td><td>${(c.timeAB * 1e3).toFixed(2)}</td><td>${(c.timeBA * 1e3).toFixed(2)}</td><td>${(c.difference * 1e3).toFixed(2)}</td><td>${(c.tolerance * 1e3).toFixed(2)}</td><td>${c.ok ? 'within tolerance' : 'outside tolerance'}</td></tr>`).join('')}</tbody></table>`);
      const sources = [...new Set(line.residuals.map((r) => r.sourceId))];
      const data: PlotData[] = sources.map((id, k) => {
        const group = line.residuals.filter((r) => r.sourceId === id);
        return { type: 'scatter', mode: 'markers', name: `source ${escapeHtml(id)}`, x: group.map((r) => fromMetres(r.receiverX, unit)), y: group.map((r) => r.difference * 1e3), marker: { size: 6, color: PALETTE[k % PALETTE.length] }, hovertemplate: `source ${escapeHtml(id)}: %{y:.2f} ms at %{x:.2f} ${unit}<extra></extra>` };
      });
      await draw(plot, data, {
        title: { text: result.forward ? `Pick minus computed first arrival: RMS ${(result.forward.rms * 1e3).toFixed(2)} ms over ${result.forward.picks} picks (line fits: ${(result.fitRmsSeconds * 1e3).toFixed(2)} ms)` : 'No forward check (no section to compute first arrivals through)', font: { size: 13 } },
        height: 300, xaxis: { title: { text: `receiver position (${unit})` } }, yaxis: { title: { text: 'residual (ms)' }, zeroline: true }, uirevision: unit,
      });
      const records = ctx.session.project.inputs.filter((i) => i.kind === 'seg2').map((i) => i.name);
      warnings.innerHTML = `<h3>Warnings (${result.warnings.length})</h3>` + (result.warnings.length === 0 ? '<p>None.</p>' : `<ul class="warnings">${result.warnings.map((w, i) => {
        const target = warningTarget(w, records);
        return `<li><span class="code">${escapeHtml(w.code)}</span> ${escapeHtml(w.message)} <button type="button" class="link" data-warning="${i}">show: ${escapeHtml(target.label)}</button></li>`;
      }).join('')}</ul>`);
    },
    focus(focus: Focus) {
      if (focus.anchor) requestAnimationFrame(() => document.getElementById(focus.anchor!)?.scrollIntoView({ block: 'start' }));
    },
    resize: () => resize(plot),
  };
}
