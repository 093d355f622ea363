import { fromMetres, toMetres } from '../../../src/core/units.js';
import { branchName } from '../../../src/fit/fitBranches.js';
import type { PickView } from '../compute.js';
import { el, escapeHtml, length } from '../format.js';
import { draw, layerColour, resize, type PlotData, type PlotElement } from '../plotly.js';
import type { AppContext, Focus, View } from './context.js';

/** Nudge of a table pick by one key press, in seconds (tables have no sample interval). */
const TABLE_NUDGE = 0.1e-3;

/**
 * Time against position for every source: the picks coloured by the layer their branch's fit gave
 * them (outliers hollow), the fitted segments drawn, the sources on the axis. A branch can be
 * given a fixed number of segments or the offsets where its segments start (the interpretation's
 * `segments` and `breakpoints` choices); a selected pick can start a new segment, which moves it
 * and the picks beyond it to the next layer.
 */
export function traveltimeView(root: HTMLElement, ctx: AppContext): View {
  const plot = el('div', { class: 'plot', id: 'traveltime-plot' }) as PlotElement;
  const branchSelect = el('select', { id: 'branch-select', 'aria-label': 'Branch' });
  const segments = el('select', { id: 'branch-segments', 'aria-label': 'Segments' });
  segments.append(el('option', { value: '' }, 'chosen by the criterion (BIC)'), ...[1, 2, 3, 4].map((n) => el('option', { value: String(n) }, `${n}`)));
  const breakpoints = el('input', { id: 'branch-breakpoints', type: 'text', inputmode: 'decimal', placeholder: 'e.g. 12.5, 40', 'aria-label': 'Segment starts' });
  const apply = el('button', { type: 'button', id: 'branch-apply' }, 'Apply to branch');
  const fromPick = el('button', { type: 'button', id: 'branch-from-pick', title: 'The selected pick and those beyond it start a new segment (the next layer)' }, 'New segment from selected pick');
  const reset = el('button', { type: 'button', id: 'branch-reset' }, 'Let the criterion choose');
  const unitLabel = el('span', {}, '');
  const summary = el('p', { class: 'branch-summary', id: 'branch-summary' });
  const panel = el('div', { class: 'controls' },
    el('label', {}, 'Branch ', branchSelect),
    el('label', {}, 'Segments ', segments),
    el('label', {}, 'New segments start at offsets ', breakpoints, unitLabel),
    apply, fromPick, reset);
  const help = el('p', { class: 'hint' }, 'Click a pick to select it. Keys: ↑ ↓ move a first-break-table pick by 0.1 ms, Delete leaves it out, A restores it. Picks of shot records are moved on the shot-record view.');
  root.append(plot, panel, summary, help);

  let branch: string | undefined;
  const fits = () => ctx.line?.result.fits ?? [];

  branchSelect.addEventListener('change', () => { branch = branchSelect.value; void view.render(); });
  apply.addEventListener('click', () => {
    if (!branch) return;
    const unit = ctx.units();
    const choices = ctx.session.project.choices;
    const nextSegments = { ...choices.segments };
    const nextBreaks = { ...choices.breakpoints };
    if (segments.value === '') delete nextSegments[branch]; else nextSegments[branch] = Number(segments.value);
    const text = breakpoints.value.trim();
    if (text === '') delete nextBreaks[branch];
    else {
      const values = text.split(/[,;\s]+/).filter((v) => v !== '').map(Number);
      if (values.some((v) => !Number.isFinite(v) || v <= 0)) {
        summary.textContent = `"${text}" is not a list of offsets; expected positive numbers in ${unit === 'ft' ? 'feet' : 'metres'}, separated by commas.`;
        summary.classList.add('problem');
        return;
      }
      nextBreaks[branch] = values.map((v) => toMetres(v, unit)).sort((a, b) => a - b);
      delete nextSegments[branch];
    }
    ctx.session.setChoices({ segments: nextSegments, breakpoints: nextBreaks }, `segments of ${branch}`);
  });
  reset.addEventListener('click', () => {
    if (!branch) return;
    const { segments: s, breakpoints: b } = ctx.session.project.choices;
    const nextSegments = { ...s };
    const nextBreaks = { ...b };
    delete nextSegments[branch];
    delete nextBreaks[branch];
    ctx.session.setChoices({ segments: nextSegments, breakpoints: nextBreaks }, `criterion for ${branch}`);
  });
  fromPick.addEventListener('click', () => {
    const pick = ctx.line?.picks.find((p) => p.key === ctx.selected);
    if (!pick || pick.time === undefined) { summary.textContent = 'Select a pick first (click it).'; return; }
    const side = pick.receiverX >= pick.sourceX ? 'forward' : 'reverse';
    const name = `${pick.sourceId}:${side}`;
    const offset = Math.abs(pick.receiverX - pick.sourceX);
    const fit = fits().find((f) => branchName(f.branch) === name);
    if (!fit || offset === 0) return;
    // Keep the branch's present segment starts and add this one, so the other segments stay.
    const present = fit.segments.slice(1).map((s) => s.firstOffset);
    const starts = [...new Set([...present, offset])].sort((a, b) => a - b);
    const { segments: s, breakpoints: b } = ctx.session.project.choices;
    const nextSegments = { ...s };
    delete nextSegments[name];
    branch = name;
    ctx.session.setChoices({ segments: nextSegments, breakpoints: { ...b, [name]: starts } }, `new segment in ${name} at ${length(offset, ctx.units(), 2)}`);
  });


  const view: View = {
    async render() {
      const line = ctx.line;
      const unit = ctx.units();
      unitLabel.textContent = unit;
      if (!line) {
        await draw(plot, [], { xaxis: { visible: false }, yaxis: { visible: false } });
        return;
      }
      const names = fits().map((f) => branchName(f.branch));
      if (!branch || !names.includes(branch)) branch = names[0];
      branchSelect.replaceChildren(...names.map((n) => el('option', { value: n, ...(n === branch ? { selected: '' } : {}) }, n)));
      const choices = ctx.session.project.choices;
      segments.value = branch && choices.segments[branch] !== undefined ? String(choices.segments[branch]) : '';
      breakpoints.value = branch && choices.breakpoints[branch] ? choices.breakpoints[branch].map((v) => Number(fromMetres(v, unit).toFixed(3))).join(', ') : '';
      const x = (metres: number) => fromMetres(metres, unit);
      const data: PlotData[] = [];
      const used = line.picks.filter((p) => p.time !== undefined);
      const layers = [...new Set(used.map((p) => p.layer))].sort((a, b) => (a ?? 99) - (b ?? 99));
      const text = (p: PickView) => `source ${escapeHtml(p.sourceId)}, x = ${length(p.receiverX, unit, 2)}<br>${(p.time! * 1e3).toFixed(2)} ms, ${p.layer === undefined ? 'in no fitted branch' : `layer ${p.layer}`}${p.outlier ? ', left out of the fit (outlier)' : ''}${p.edited ? ', set by hand' : ''}`;
      for (const layer of layers) {
        const group = used.filter((p) => p.layer === layer);
        data.push({
          type: 'scatter', mode: 'markers', name: layer === undefined ? 'picks in no branch' : layer === 1 ? 'layer 1 (direct wave)' : `layer ${layer} (refracted)`,
          x: group.map((p) => x(p.receiverX)), y: group.map((p) => p.time! * 1e3), customdata: group.map((p) => p.key),
          marker: { size: 6, color: group.map((p) => (p.outlier ? '#ffffff' : layerColour(layer))), line: { width: 1.2, color: layerColour(layer) }, symbol: group.map((p) => (p.edited ? 'diamond' : 'circle')) },
          text: group.map(text), hovertemplate: '%{text}<extra></extra>',
        });
      }
      for (const fit of fits()) {
        const sign = fit.branch.side === 'forward' ? 1 : -1;
        const bold = branchName(fit.branch) === branch;
        for (const s of fit.segments) {
          // Each line over its picks, carried to where it crosses its neighbours.
          const nextCrossover = fit.segments[s.order]?.crossoverOffset;
          const offsets = [Math.min(s.firstOffset, s.crossoverOffset ?? Infinity), Math.max(s.lastOffset, nextCrossover ?? -Infinity)];
          data.push({
            type: 'scatter', mode: 'lines', showlegend: false, hoverinfo: 'text',
            text: `${escapeHtml(branchName(fit.branch))} segment ${s.order}: layer ${s.layer}, apparent velocity ${Math.round(x(s.apparentVelocity))} ${unit}/s, intercept ${(s.intercept * 1e3).toFixed(2)} ms`,
            x: offsets.map((o) => x(fit.branch.sourceX + sign * o)), y: offsets.map((o) => (s.intercept + s.slowness * o) * 1e3),
            line: { color: layerColour(s.layer), width: bold ? 3.2 : 1.4 },
          });
        }
      }
      data.push({ type: 'scatter', mode: 'markers+text', name: 'sources', x: line.sources.map((s) => x(s.x)), y: line.sources.map(() => 0), text: line.sources.map((s) => escapeHtml(s.id)), textposition: 'bottom center', marker: { symbol: 'star', size: 12, color: '#2b2a26' }, hovertemplate: 'source %{text} at %{x}<extra></extra>' });
      const selected = line.picks.find((p) => p.key === ctx.selected && p.time !== undefined);
      if (selected) data.push({ type: 'scatter', mode: 'markers', name: 'selected pick', x: [x(selected.receiverX)], y: [selected.time! * 1e3], marker: { size: 16, symbol: 'circle-open', line: { width: 2.5, color: '#1565c0' } }, hoverinfo: 'skip' });
      const p = await draw(plot, data, {
        title: { text: `First breaks of ${escapeHtml(line.name)} against position, with the fitted segments`, font: { size: 13 } },
        xaxis: { title: { text: `position along the line (${unit})` }, zeroline: false },
        yaxis: { title: { text: 'first-break time (ms)' }, rangemode: 'tozero' },
        uirevision: `${line.name}|${unit}`,
      });
      if (!(p as unknown as { _hammerlineClick?: boolean })._hammerlineClick) {
        (p as unknown as { _hammerlineClick?: boolean })._hammerlineClick = true;
        p.on?.('plotly_click', (event: { points: { customdata?: string }[] }) => {
          const key = event.points.find((pt) => typeof pt.customdata === 'string')?.customdata;
          if (key) { ctx.selected = key; ctx.refresh(); }
        });
      }
      const fit = fits().find((f) => branchName(f.branch) === branch);
      summary.classList.remove('problem');
      summary.innerHTML = fit
        ? `<b>${escapeHtml(branch!)}</b>: ${fit.branch.picks.length} picks, ${fit.segments.length} segment${fit.segments.length > 1 ? 's' : ''} (${fit.chosenBy === 'user' ? 'as chosen' : 'by the criterion'}), residual ${(fit.residualSd * 1e3).toFixed(2)} ms. ` +
          fit.segments.map((s) => `Segment ${s.order}: layer ${s.layer}, offsets ${length(s.firstOffset, unit, 1)} to ${length(s.lastOffset, unit, 1)}, ${Math.round(fromMetres(s.apparentVelocity, unit))} ${unit}/s${s.crossoverOffset !== undefined ? `, crossover at ${length(s.crossoverOffset, unit, 1)}` : ''}`).join('; ') +
          (selected ? `<br>Selected pick: ${text(selected).replace('<br>', '; ')}` : '')
        : '';
    },

    onKey(event) {
      const line = ctx.line;
      const pick = line?.picks.find((p) => p.key === ctx.selected);
      if (!line || !pick || pick.row === undefined) return false;
      if (event.key === 'ArrowUp' || event.key === 'ArrowDown') {
        const now = ctx.timeNow(pick);
        if (now === undefined) return true;
        const time = Math.max(0, now + (event.shiftKey ? 10 : 1) * (event.key === 'ArrowUp' ? -1 : 1) * TABLE_NUDGE);
        ctx.session.setPick({ file: pick.file, row: pick.row }, Number(time.toFixed(7)), `move row ${pick.row}`);
        return true;
      }
      if (event.key === 'Delete' || event.key === 'Backspace') { ctx.session.setPick({ file: pick.file, row: pick.row }, null, `leave out row ${pick.row}`); return true; }
      if (event.key === 'a' || event.key === 'A') { ctx.session.setPick({ file: pick.file, row: pick.row }, undefined, `restore row ${pick.row}`); return true; }
      return false;
    },

    focus(focus: Focus) {
      if (focus.source) {
        const name = fits().map((f) => branchName(f.branch)).find((n) => n.startsWith(`${focus.source}:`));
        if (name) branch = name;
      }
    },

    resize: () => resize(plot),
  };
  return view;
}
