import { fromMetres } from '../../../src/core/units.js';
import type { ProjectInput } from '../../../src/io/projectFile.js';
import { readSeg2 } from '../../../src/io/seg2/read.js';
import type { Seg2Record } from '../../../src/io/seg2/types.js';
import { pickKey, type PickView } from '../compute.js';
import { el, escapeHtml, length } from '../format.js';
import { draw, eventToData, resize, type PlotData, type PlotElement } from '../plotly.js';
import type { AppContext, Focus, View } from './context.js';

const parsed = new WeakMap<ProjectInput, Seg2Record>();

function recordOf(input: ProjectInput): Seg2Record {
  let record = parsed.get(input);
  if (record === undefined) {
    record = readSeg2(input.bytes, input.name);
    parsed.set(input, record);
  }
  return record;
}

/**
 * The shot records: every trace of one record as a wiggle, variable area or both, with gain,
 * clipping and normalisation by trace or by record; the pick of every trace (automatic ones shaded
 * by their confidence, hand picks marked, unpicked traces crossed at the top). A click sets the
 * pick of the nearest trace; keys nudge it by a sample, move between traces and records, clear it
 * or restore the automatic pick.
 */
export function recordsView(root: HTMLElement, ctx: AppContext): View {
  const recordSelect = el('select', { id: 'record-select', 'aria-label': 'Shot record' });
  const display = el('select', { id: 'record-display', 'aria-label': 'Trace display' });
  for (const [value, text] of [['both', 'wiggle and variable area'], ['wiggle', 'wiggle'], ['area', 'variable area']]) display.append(el('option', { value }, text));
  const gain = el('input', { id: 'record-gain', type: 'range', min: '-2', max: '4', step: '0.25', value: '0', 'aria-label': 'Gain' });
  const gainText = el('span', { class: 'value' }, '×1');
  const clip = el('select', { id: 'record-clip', 'aria-label': 'Clip' });
  for (const value of ['0.5', '1', '1.5', '2', '3']) clip.append(el('option', { value, ...(value === '1' ? { selected: '' } : {}) }, `${value} trace spacing`));
  const normalise = el('select', { id: 'record-normalise', 'aria-label': 'Normalise' });
  normalise.append(el('option', { value: 'trace' }, 'each trace'), el('option', { value: 'record' }, 'whole record'));
  const previous = el('button', { type: 'button', title: 'Previous record (Page Up)' }, '◀');
  const next = el('button', { type: 'button', title: 'Next record (Page Down)' }, '▶');
  const controls = el('div', { class: 'controls' },
    el('label', {}, 'Record ', previous, recordSelect, next),
    el('label', {}, 'Display ', display),
    el('label', {}, 'Gain ', gain, gainText),
    el('label', {}, 'Clip at ', clip),
    el('label', {}, 'Normalise ', normalise));
  const plot = el('div', { class: 'plot', id: 'records-plot' }) as PlotElement;
  const info = el('p', { class: 'pick-info', id: 'pick-info', 'aria-live': 'polite' });
  const help = el('p', { class: 'hint' }, 'Click a trace to set its first break. Keys: ↑ ↓ move the pick one sample (Shift: ten), ← → next trace, Delete clears the pick, A restores the automatic pick, Page Up / Page Down change record.');
  root.append(controls, plot, info, help);

  let current: string | undefined;
  const records = () => ctx.session.project.inputs.filter((i) => i.kind === 'seg2');
  const redraw = () => { void view.render(); };
  for (const control of [display, clip, normalise]) control.addEventListener('change', redraw);
  gain.addEventListener('input', () => { gainText.textContent = `×${(2 ** Number(gain.value)).toFixed(2).replace(/\.?0+$/, '')}`; redraw(); });
  recordSelect.addEventListener('change', () => { current = recordSelect.value; ctx.selected = undefined; redraw(); });
  const step = (by: number) => {
    const list = records();
    const at = list.findIndex((r) => r.name === current);
    if (list.length === 0) return;
    current = list[(at + by + list.length) % list.length].name;
    ctx.selected = undefined;
    redraw();
  };
  previous.addEventListener('click', () => step(-1));
  next.addEventListener('click', () => step(1));

  const picksOf = (file: string): PickView[] => (ctx.line?.picks ?? []).filter((p) => p.file === file);

  plot.addEventListener('click', (event) => {
    const input = records().find((r) => r.name === current);
    const at = eventToData(plot, event);
    if (!input || !at) return;
    const record = recordOf(input);
    const picks = picksOf(input.name);
    const unit = ctx.units();
    let best: PickView | undefined;
    for (const p of picks) if (best === undefined || Math.abs(fromMetres(p.receiverX, unit) - at.x) < Math.abs(fromMetres(best.receiverX, unit) - at.x)) best = p;
    if (!best) return;
    const trace = record.traces.find((t) => t.index === best!.trace)!;
    const time = snap(at.y / 1e3, trace.delay, trace.sampleInterval);
    ctx.selected = best.key;
    ctx.session.setPick({ file: input.name, trace: best.trace }, time, `pick ${input.name} trace ${best.trace}`);
  });

  // The trace lines are rebuilt only when the record, the positions or the display change, and are
  // handed to plotly as the same arrays otherwise, so a pick edit redraws the picks alone.
  let traceCache: { key: string; lines: ReturnType<typeof buildTraceLines> } | undefined;
  function traceLines(input: ProjectInput, record: Seg2Record, positions: number[], scale: number, clipAt: number) {
    const key = `${input.name}|${input.bytes.length}|${positions.join(',')}|${scale}|${clipAt}|${normalise.value}`;
    if (traceCache?.key !== key || parsed.get(input) !== record) traceCache = { key, lines: buildTraceLines(record, positions, scale, clipAt, normalise.value === 'trace') };
    return traceCache.lines;
  }

  function snap(time: number, delay: number, interval: number): number {
    return Math.max(0, delay + Math.round((time - delay) / interval) * interval);
  }

  const view: View = {
    async render() {
      const list = records();
      if (!list.some((r) => r.name === current)) current = list[0]?.name;
      recordSelect.replaceChildren(...list.map((r) => el('option', { value: r.name, ...(r.name === current ? { selected: '' } : {}) }, r.name)));
      const input = list.find((r) => r.name === current);
      if (!input) {
        info.textContent = ctx.line?.kind === 'table' ? 'This line was given as a first-break table: there are no shot records to show. Its picks can be moved on the time–distance view.' : 'No shot record loaded.';
        await draw(plot, [], { title: { text: '' }, xaxis: { visible: false }, yaxis: { visible: false } });
        return;
      }
      const unit = ctx.units();
      const record = recordOf(input);
      const picks = new Map(picksOf(input.name).map((p) => [p.trace!, p]));
      const positions = record.traces.map((t, i) => {
        const p = picks.get(t.index);
        // Before an interpretation (or without one) the headers place the trace, else its order.
        return fromMetres(p ? p.receiverX : t.receiverLocation?.[0] ?? i + 1, unit);
      });
      const sorted = [...positions].sort((a, b) => a - b);
      const gaps = sorted.slice(1).map((x, i) => x - sorted[i]).filter((g) => g > 0).sort((a, b) => a - b);
      const spacing = gaps.length > 0 ? gaps[Math.floor(gaps.length / 2)] : 1;
      const scale = 2 ** Number(gain.value) * spacing * 0.5;
      const clipAt = Number(clip.value) * spacing * 0.5;
      const traces = traceLines(input, record, positions, scale, clipAt);
      const { earliest, latest } = traces;
      const all = [...picks.values()];
      const pickTimes = all.filter((p) => p.time !== undefined).map((p) => p.time! * 1e3);
      const bottom = Math.min(latest, Math.max(20, (pickTimes.length > 0 ? Math.max(...pickTimes) : latest) * 1.5));
      const data: PlotData[] = [];
      // The traces are painted on a canvas laid under the plot as an image (the picks stay plotly
      // markers): a pick edit then redraws a few markers, not tens of thousands of trace points.
      const xs = positions.length > 0 ? positions : [0];
      const ownRange = { x: [Math.min(...xs) - spacing, Math.max(...xs) + spacing], y: [bottom, Math.max(earliest, -5)] };
      const shown = plot._fullLayout && (plot as unknown as { _hammerlineRevision?: string })._hammerlineRevision === `${input.name}|${unit}`
        ? { x: (plot._fullLayout.xaxis as unknown as { range: number[] }).range, y: (plot._fullLayout.yaxis as unknown as { range: number[] }).range }
        : ownRange;
      const size = (plot._fullLayout as unknown as { _size?: { w: number; h: number } } | undefined)?._size ?? { w: Math.max(200, plot.clientWidth - 80), h: Math.max(200, plot.clientHeight - 120) };
      const image = traceImage(traces, shown, size, display.value);
      const automatic = all.filter((p) => p.time !== undefined && !p.edited);
      const byHand = all.filter((p) => p.time !== undefined && p.edited);
      const unpicked = all.filter((p) => p.time === undefined);
      const position = (p: PickView) => positions[record.traces.findIndex((t) => t.index === p.trace)];
      const describe = (p: PickView) => `trace ${p.trace}, x = ${length(p.receiverX, unit, 2)}<br>${p.time !== undefined ? `${(p.time * 1e3).toFixed(2)} ms` : 'not picked'}${p.edited ? ' (by hand)' : p.confidence !== undefined ? `<br>confidence ${p.confidence.toFixed(2)} (${escapeHtml(p.status ?? '')})` : ''}`;
      data.push({
        type: 'scatter', mode: 'markers', name: 'automatic pick (shade: confidence)', x: automatic.map(position), y: automatic.map((p) => p.time! * 1e3),
        marker: { size: 9, symbol: 'line-ew-open', line: { width: 3 }, color: automatic.map((p) => p.confidence ?? 0), cmin: 0, cmax: 1, colorscale: [[0, '#f2b8a0'], [0.5, '#e0662f'], [1, '#8f1d00']], colorbar: { title: { text: 'confidence' }, thickness: 10, len: 0.5, x: 1.01 } },
        text: automatic.map(describe), hovertemplate: '%{text}<extra></extra>',
      });
      data.push({ type: 'scatter', mode: 'markers', name: 'pick by hand', x: byHand.map(position), y: byHand.map((p) => p.time! * 1e3), marker: { size: 10, symbol: 'diamond', color: '#1565c0', line: { color: '#ffffff', width: 1 } }, text: byHand.map(describe), hovertemplate: '%{text}<extra></extra>' });
      const movedFrom = byHand.filter((p) => p.autoTime !== undefined);
      data.push({ type: 'scatter', mode: 'markers', name: 'automatic pick before the edit', x: movedFrom.map(position), y: movedFrom.map((p) => p.autoTime! * 1e3), marker: { size: 7, symbol: 'line-ew', line: { width: 2, color: '#9e9e9e' } }, hoverinfo: 'skip' });
      data.push({ type: 'scatter', mode: 'markers', name: 'not picked', x: unpicked.map(position), y: unpicked.map(() => Math.max(earliest, 0) + 1), marker: { size: 11, symbol: 'x-thin-open', line: { width: 2, color: '#b3261e' } }, text: unpicked.map(describe), hovertemplate: '%{text}<extra></extra>' });
      const selected = all.find((p) => p.key === ctx.selected);
      const shapes = selected ? [{ type: 'rect', xref: 'x', yref: 'paper', x0: position(selected) - spacing / 2, x1: position(selected) + spacing / 2, y0: 0, y1: 1, fillcolor: 'rgba(21,101,192,0.10)', line: { width: 0 } }] : [];
      const source = all[0];
      await draw(plot, data, {
        title: { text: `${escapeHtml(input.name)}: source ${source ? escapeHtml(source.sourceId) : ''} at x = ${length(source ? source.sourceX : record.traces[0]?.sourceLocation?.[0], unit, 2)}, ${record.traces.length} trace${record.traces.length === 1 ? '' : 's'}${source ? '' : ' (not interpreted: no picks shown)'}`, font: { size: 13 } },
        xaxis: { title: { text: `receiver position (${unit})` }, zeroline: false, autorange: false, range: ownRange.x },
        yaxis: { title: { text: 'time after the shot (ms)' }, autorange: false, range: ownRange.y, zeroline: true, zerolinecolor: '#c8c2b4' },
        images: [{ source: image, xref: 'paper', yref: 'paper', x: 0, y: 1, sizex: 1, sizey: 1, xanchor: 'left', yanchor: 'top', sizing: 'stretch', layer: 'below' }],
        shapes,
        uirevision: `${input.name}|${unit}`,
        dragmode: 'zoom',
      });
      const element = plot as unknown as { _hammerlineRevision?: string; _hammerlineZoom?: boolean };
      element._hammerlineRevision = `${input.name}|${unit}`;
      if (!element._hammerlineZoom) {
        element._hammerlineZoom = true;
        // A zoom or pan repaints the traces for the new ranges.
        plot.on?.('plotly_relayout', (change: Record<string, unknown>) => { if (Object.keys(change).some((k) => k.includes('range') || k.includes('autorange'))) void view.render(); });
      }
      const now = (plot._fullLayout as unknown as { _size: { w: number; h: number } })._size;
      if (now.w !== size.w || now.h !== size.h) { void view.render(); return; }
      info.innerHTML = selected ? `Selected: ${describe(selected).replace(/<br>/g, '; ')}${selected.edited && selected.autoTime !== undefined ? `; automatic pick ${(selected.autoTime * 1e3).toFixed(2)} ms` : ''}` : 'No trace selected.';
    },

    onKey(event) {
      const input = records().find((r) => r.name === current);
      if (!input) return false;
      if (event.key === 'PageUp' || event.key === 'PageDown') { step(event.key === 'PageUp' ? -1 : 1); return true; }
      const record = recordOf(input);
      const picks = picksOf(input.name).sort((a, b) => a.receiverX - b.receiverX || a.trace! - b.trace!);
      let at = picks.findIndex((p) => p.key === ctx.selected);
      if (event.key === 'ArrowLeft' || event.key === 'ArrowRight') {
        at = at < 0 ? 0 : Math.max(0, Math.min(picks.length - 1, at + (event.key === 'ArrowLeft' ? -1 : 1)));
        ctx.selected = picks[at]?.key;
        ctx.refresh();
        return true;
      }
      const pick = picks[at];
      if (!pick) return false;
      const trace = record.traces.find((t) => t.index === pick.trace)!;
      if (event.key === 'ArrowUp' || event.key === 'ArrowDown') {
        const now = ctx.timeNow(pick);
        if (now === undefined) return true;
        const samples = (event.shiftKey ? 10 : 1) * (event.key === 'ArrowUp' ? -1 : 1);
        const time = snap(now + samples * trace.sampleInterval, trace.delay, trace.sampleInterval);
        ctx.session.setPick({ file: input.name, trace: pick.trace }, time, `nudge ${input.name} trace ${pick.trace}`);
        return true;
      }
      if (event.key === 'Delete' || event.key === 'Backspace') {
        ctx.session.setPick({ file: input.name, trace: pick.trace }, null, `clear ${input.name} trace ${pick.trace}`);
        return true;
      }
      if (event.key === 'a' || event.key === 'A') {
        if (ctx.session.project.picks.some((p) => p.file === input.name && p.trace === pick.trace)) ctx.session.setPick({ file: input.name, trace: pick.trace }, undefined, `automatic pick ${input.name} trace ${pick.trace}`);
        return true;
      }
      return false;
    },

    focus(focus: Focus) {
      if (focus.record) current = focus.record;
      if (focus.record && focus.trace !== undefined) ctx.selected = pickKey(focus.record, { trace: focus.trace });
    },

    resize: () => resize(plot),
  };
  return view;
}

/** Wiggle and variable-area polylines of every trace (null between traces), times in ms. */
function buildTraceLines(record: Seg2Record, positions: number[], scale: number, clipAt: number, byTrace: boolean) {
  let recordMax = 0;
  for (const t of record.traces) for (const v of t.data) recordMax = Math.max(recordMax, Math.abs(v));
  const wiggleX: (number | null)[] = [];
  const wiggleY: (number | null)[] = [];
  const areaX: (number | null)[] = [];
  const areaY: (number | null)[] = [];
  let earliest = Infinity;
  let latest = -Infinity;
  record.traces.forEach((t, i) => {
    let traceMax = 0;
    for (const v of t.data) traceMax = Math.max(traceMax, Math.abs(v));
    const norm = (byTrace ? traceMax : recordMax) || 1;
    const x0 = positions[i];
    const first = t.delay * 1e3;
    const dt = t.sampleInterval * 1e3;
    earliest = Math.min(earliest, first);
    latest = Math.max(latest, first + dt * (t.data.length - 1));
    for (let k = 0; k < t.data.length; k++) {
      const d = Math.max(-clipAt, Math.min(clipAt, (t.data[k] / norm) * scale));
      wiggleX.push(x0 + d);
      wiggleY.push(first + k * dt);
      areaX.push(x0 + Math.max(d, 0));
      areaY.push(first + k * dt);
    }
    wiggleX.push(null); wiggleY.push(null);
    areaX.push(x0, x0, null); areaY.push(first + dt * (t.data.length - 1), first, null);
  });
  return { wiggleX, wiggleY, areaX, areaY, earliest, latest };
}

let imageCache: { key: string; url: string; lines: unknown } | undefined;

/** The traces painted for the given axis ranges (x: [left, right], y: [bottom time, top time], ms) and plot size in pixels. */
function traceImage(lines: ReturnType<typeof buildTraceLines>, range: { x: number[]; y: number[] }, size: { w: number; h: number }, display: string): string {
  const scale = Math.min(2, window.devicePixelRatio || 1);
  const key = `${range.x.join(',')}|${range.y.join(',')}|${size.w}x${size.h}|${display}|${scale}`;
  if (imageCache?.key === key && imageCache.lines === lines) return imageCache.url;
  const canvas = document.createElement('canvas');
  canvas.width = Math.round(size.w * scale);
  canvas.height = Math.round(size.h * scale);
  const context = canvas.getContext('2d')!;
  const px = (x: number) => ((x - range.x[0]) / (range.x[1] - range.x[0])) * canvas.width;
  const py = (t: number) => ((t - range.y[1]) / (range.y[0] - range.y[1])) * canvas.height;
  const path = (xs: (number | null)[], ts: (number | null)[]) => {
    context.beginPath();
    let open = false;
    for (let i = 0; i < xs.length; i++) {
      if (xs[i] === null) { open = false; continue; }
      const x = px(xs[i]!);
      const y = py(ts[i]!);
      if (open) context.lineTo(x, y); else { context.moveTo(x, y); open = true; }
    }
  };
  if (display !== 'wiggle') {
    // Each trace's positive lobes as one closed polygon down the trace and back up its axis.
    path(lines.areaX, lines.areaY);
    context.fillStyle = 'rgba(40,44,52,0.55)';
    context.fill();
  }
  if (display !== 'area') {
    path(lines.wiggleX, lines.wiggleY);
    context.strokeStyle = '#262a30';
    context.lineWidth = 0.8 * scale;
    context.stroke();
  }
  const url = canvas.toDataURL('image/png');
  imageCache = { key, url, lines };
  return url;
}
