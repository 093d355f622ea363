// plotly.js-dist is the ready-made browser bundle (design card); its scatter traces need no eval,
// so the page's Content-Security-Policy can forbid it.
import PlotlyBundle from 'plotly.js-dist';

/* eslint-disable @typescript-eslint/no-explicit-any */
export type PlotData = Record<string, any>;
export type PlotLayout = Record<string, any>;

/** A plot element with the internals used to turn a click into data coordinates. */
export interface PlotElement extends HTMLElement {
  _fullLayout?: { xaxis: { _offset: number; p2d: (px: number) => number }; yaxis: { _offset: number; p2d: (px: number) => number } };
  on?: (event: string, handler: (data: any) => void) => void;
}

const plotly = PlotlyBundle as unknown as {
  react: (element: HTMLElement, data: PlotData[], layout: PlotLayout, config?: Record<string, unknown>) => Promise<PlotElement>;
  purge: (element: HTMLElement) => void;
  Plots: { resize: (element: HTMLElement) => void };
};

const CONFIG = { displaylogo: false, responsive: true, modeBarButtonsToRemove: ['select2d', 'lasso2d', 'autoScale2d'], doubleClick: 'reset' };

/** Draws or updates a plot in place (Plotly.react keeps the zoom when `uirevision` is set). */
export function draw(element: HTMLElement, data: PlotData[], layout: PlotLayout): Promise<PlotElement> {
  const title = layout.title ? { ...BASE_LAYOUT.title, ...layout.title, font: { ...BASE_LAYOUT.title.font, ...(layout.title.font ?? {}) } } : undefined;
  return plotly.react(element, data, { ...BASE_LAYOUT, ...layout, ...(title ? { title } : {}) }, CONFIG);
}

export function resize(element: HTMLElement): void {
  if ((element as PlotElement)._fullLayout) plotly.Plots.resize(element);
}

/** Data coordinates of a mouse event inside a plot's axes, or undefined outside them. */
export function eventToData(element: PlotElement, event: MouseEvent): { x: number; y: number } | undefined {
  const layout = element._fullLayout;
  if (!layout) return undefined;
  const box = element.getBoundingClientRect();
  const px = event.clientX - box.left - layout.xaxis._offset;
  const py = event.clientY - box.top - layout.yaxis._offset;
  const plotArea = element.querySelector('.nsewdrag')?.getBoundingClientRect();
  if (plotArea && (event.clientX < plotArea.left || event.clientX > plotArea.right || event.clientY < plotArea.top || event.clientY > plotArea.bottom)) return undefined;
  return { x: layout.xaxis.p2d(px), y: layout.yaxis.p2d(py) };
}

const BASE_LAYOUT: PlotLayout = {
  font: { family: 'system-ui, sans-serif', size: 12, color: '#2b2a26' },
  paper_bgcolor: '#fbfaf7',
  plot_bgcolor: '#ffffff',
  margin: { l: 64, r: 16, t: 52, b: 48 },
  hovermode: 'closest',
  // Title at the left, legend above the plot at the right: neither covers the axis titles.
  title: { x: 0, xanchor: 'left', y: 0.99, yanchor: 'top', font: { size: 13 } },
  legend: { orientation: 'h', x: 1, xanchor: 'right', y: 1.0, yanchor: 'bottom', font: { size: 11 } },
};

/** Colours of layers 1 to 5 (our own palette: earth tones darkening with depth). */
export const LAYER_COLOURS = ['#d08c2f', '#3f7f6b', '#5b5ea6', '#a34d5d', '#6b6b6b'];
export function layerColour(layer: number | undefined): string {
  return layer === undefined ? '#9a9a9a' : LAYER_COLOURS[Math.min(layer, LAYER_COLOURS.length) - 1];
}
