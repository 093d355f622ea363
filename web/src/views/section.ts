import { formatSe, fromMetres } from '../../../src/core/units.js';
import { el, escapeHtml, length, velocity } from '../format.js';
import { draw, layerColour, resize, type PlotData, type PlotElement } from '../plotly.js';
import type { AppContext, Focus, View } from './context.js';

const METHOD_DASH: Record<string, string> = { 'delay-time': 'dot', GRM: 'dash', 'plus-minus': 'dashdot', 'intercept-time': 'solid' };

/**
 * The section: the ground with its geophones and sources, each refractor by every depth method,
 * the recommended profile drawn heavy with its band of ± one standard error, the layer velocities
 * written in the layers, and beside it the cautions and the warnings that qualify the depths.
 */
export function sectionView(root: HTMLElement, ctx: AppContext): View {
  const plot = el('div', { class: 'plot', id: 'section-plot' }) as PlotElement;
  const table = el('div', { class: 'depth-summary', id: 'depth-summary' });
  const cautions = el('aside', { class: 'cautions', id: 'section-cautions' });
  root.append(el('div', { class: 'with-side' }, el('div', { class: 'main-column' }, plot, table), cautions));

  const view: View = {
    async render() {
      const line = ctx.line;
      if (!line) { await draw(plot, [], {}); return; }
      const unit = ctx.units();
      const x = (m: number) => fromMetres(m, unit);
      const result = line.result;
      const data: PlotData[] = [];
      data.push({ type: 'scatter', mode: 'lines', name: 'ground', x: line.receivers.map((r) => x(r.x)), y: line.receivers.map((r) => x(r.elev)), line: { color: '#6d4c2f', width: 2.5 }, hovertemplate: `ground %{y:.2f} ${unit} at %{x:.2f} ${unit}<extra></extra>` });
      data.push({ type: 'scatter', mode: 'markers', name: 'geophones', x: line.receivers.map((r) => x(r.x)), y: line.receivers.map((r) => x(r.elev)), marker: { symbol: 'triangle-down', size: 7, color: '#6d4c2f' }, hoverinfo: 'skip' });
      data.push({ type: 'scatter', mode: 'markers+text', name: 'sources', x: line.sources.map((s) => x(s.x)), y: line.sources.map((s) => x(s.elev)), text: line.sources.map((s) => escapeHtml(s.id)), textposition: 'top center', marker: { symbol: 'star', size: 12, color: '#2b2a26' }, hovertemplate: 'source %{text}<extra></extra>' });
      for (const refractor of result.refractors) {
        const colour = layerColour(refractor.index + 1);
        const pts = refractor.points;
        const upper = pts.map((p) => x(p.elev + p.depthSe));
        const lower = pts.map((p) => x(p.elev - p.depthSe));
        data.push({ type: 'scatter', mode: 'lines', x: pts.map((p) => x(p.x)), y: upper, line: { width: 0 }, hoverinfo: 'skip', showlegend: false });
        data.push({ type: 'scatter', mode: 'lines', name: `refractor ${refractor.index}: ± 1 standard error`, x: pts.map((p) => x(p.x)), y: lower, fill: 'tonexty', fillcolor: `${colour}33`, line: { width: 0 }, hoverinfo: 'skip' });
        for (const [method, points] of Object.entries(refractor.byMethod)) {
          if (points.length === 0) continue;
          data.push({
            type: 'scatter', mode: method === 'intercept-time' ? 'markers' : 'lines', name: `refractor ${refractor.index}, ${method}`,
            x: points.map((p) => x(p.x)), y: points.map((p) => x(p.elev)),
            line: { color: colour, width: 1.2, dash: METHOD_DASH[method] ?? 'solid' }, marker: { symbol: 'square-open', size: 8, color: colour },
            text: points.map((p) => `${method}: depth ${length(p.depth, unit, 2)} ± ${formatSe(fromMetres(p.depthSe, unit), 2)} ${unit}`), hovertemplate: '%{text}<extra></extra>',
          });
        }
        data.push({
          type: 'scatter', mode: 'lines', name: `refractor ${refractor.index}, recommended (${escapeHtml(refractor.method)})`,
          x: pts.map((p) => x(p.x)), y: pts.map((p) => x(p.elev)), line: { color: colour, width: 4 },
          text: pts.map((p, i) => `refractor ${refractor.index} at x = ${length(p.x, unit, 2)}<br>depth ${length(p.depth, unit, 2)} ± ${formatSe(fromMetres(p.depthSe, unit), 2)} ${unit}, elevation ${length(p.elev, unit, 2)}<br>${escapeHtml(refractor.pointMethods[i] ?? refractor.method)}`),
          hovertemplate: '%{text}<extra></extra>',
        });
      }
      // Layer velocities written inside each layer, at the middle of the line.
      const mid = line.receivers[Math.floor(line.receivers.length / 2)];
      const annotations = result.layers.map((layer, k) => {
        const above = k === 0 ? mid?.elev : result.refractors[k - 1]?.points.find((p) => p.x === mid?.x)?.elev;
        const below = result.refractors[k]?.points.find((p) => p.x === mid?.x)?.elev;
        if (above === undefined || mid === undefined) return undefined;
        const y = below === undefined ? above - 2 : (above + below) / 2;
        return { x: x(mid.x), y: x(y), text: `layer ${layer.index}: ${velocity(layer.velocity, layer.velocitySe, unit)}`, showarrow: false, font: { color: layerColour(layer.index), size: 12 }, bgcolor: 'rgba(255,255,255,0.8)' };
      }).filter((a) => a !== undefined);
      await draw(plot, data, {
        title: { text: `Section along ${escapeHtml(line.name)} (elevations; depths below the ground at each geophone)`, font: { size: 13 } },
        xaxis: { title: { text: `position along the line (${unit})` }, zeroline: false },
        yaxis: { title: { text: `elevation (${unit})` }, zeroline: false },
        annotations,
        margin: { l: 64, r: 16, t: 92, b: 48 },
        uirevision: `${line.name}|${unit}`,
      });
      table.innerHTML = result.refractors.length === 0
        ? '<p class="problem">No refractor depth could be computed (see the warnings on the checks view).</p>'
        : `<table><thead><tr><th>refractor</th><th>velocity below</th><th>recommended</th><th>depth below ground (${unit})</th><th>standard error (${unit})</th></tr></thead><tbody>${result.refractors.map((r) => {
          const depths = r.points.map((p) => p.depth);
          const ses = r.points.map((p) => p.depthSe);
          return `<tr data-refractor="${r.index}"><td>${r.index}</td><td>${velocity(result.layers[r.index]?.velocity, result.layers[r.index]?.velocitySe, unit)}</td><td>${escapeHtml(r.method)}</td><td>${depths.length ? `${fromMetres(Math.min(...depths), unit).toFixed(2)} to ${fromMetres(Math.max(...depths), unit).toFixed(2)}` : '–'}</td><td>${ses.length ? `${fromMetres(Math.min(...ses), unit).toFixed(2)} to ${fromMetres(Math.max(...ses), unit).toFixed(2)}` : '–'}</td></tr>`;
        }).join('')}</tbody></table>`;
      const layerWarnings = result.warnings.filter((w) => w.layer !== undefined || ['hidden-layer-limit', 'water-table', 'velocity-inversion', 'methods-disagree', 'interpolated-depths', 'no-direct-wave', 'not-covered'].includes(w.code));
      cautions.innerHTML = `<h3>Before using these depths</h3><ul>${result.cautions.map((c) => `<li>${escapeHtml(c.message)}</li>`).join('')}</ul>` +
        (layerWarnings.length ? `<h3>Warnings on this section</h3><ul>${layerWarnings.map((w) => `<li><span class="code">${escapeHtml(w.code)}</span> ${escapeHtml(w.message)}</li>`).join('')}</ul>` : '');
    },
    focus(_focus: Focus) {},
    resize: () => resize(plot),
  };
  return view;
}
