import { escapeHtml } from './escape.js';
import { minOf, maxOf } from '../../core/extent.js';
import { seDecimals } from '../../core/units.js';

/** A JSON value at a dotted path ("layers.0.velocity_mps"), or undefined where there is none. */
export function valueAt(document: unknown, path: string): unknown {
  let node: unknown = document;
  for (const key of path.split('.')) {
    if (node === null || typeof node !== 'object') return undefined;
    node = (node as Record<string, unknown>)[key];
  }
  return node;
}

/** Thickness of layer `layer` (1 = top) at every position where it and the refractors bounding it have a point, in metres. */
export function layerThicknesses(document: unknown, layer: number): number[] {
  const points = (k: number) => new Map(((valueAt(document, `refractors.${k - 1}.points`) as { x_m: number; depth_m: number }[] | undefined) ?? []).map((p) => [p.x_m, p.depth_m]));
  const base = points(layer);
  if (layer === 1) return [...base.values()];
  const top = points(layer - 1);
  return [...base.entries()].filter(([x]) => top.has(x)).map(([x, d]) => d - top.get(x)!);
}

/**
 * The numbers of the report, each taken from the JSON interpretation document and written with
 * where it came from (data-json: its path; data-agg: min or max over an array; data-digits: the
 * decimals shown), so every figure in the report can be traced and checked against the document.
 */
export class Figures {
  constructor(readonly document: Record<string, unknown>) {}

  get(path: string): unknown {
    return valueAt(this.document, path);
  }

  number(path: string): number | undefined {
    const value = this.get(path);
    return typeof value === 'number' && Number.isFinite(value) ? value : undefined;
  }

  /** The number at `path`, shown with `digits` decimals (an em dash where there is none). */
  num(path: string, digits: number): string {
    const value = this.number(path);
    return span(`data-json="${escapeHtml(path)}"`, value, digits);
  }

  /** value ± standard error, both from the document; a positive standard error gets the decimals it needs not to read as zero (seDecimals). */
  pm(path: string, sePath: string, digits: number): string {
    const se = this.number(sePath);
    return se === undefined ? this.num(path, digits) : `${this.num(path, digits)} ± ${this.num(sePath, se > 0 ? seDecimals(se, digits) : digits)}`;
  }

  /** The least or greatest value of `field` over the array at `path`. */
  agg(path: string, field: string, how: 'min' | 'max', digits: number): string {
    const values = ((this.get(path) as Record<string, unknown>[] | undefined) ?? []).map((o) => o[field]).filter((v): v is number => typeof v === 'number' && Number.isFinite(v));
    const value = values.length === 0 ? undefined : how === 'min' ? minOf(values) : maxOf(values);
    return span(`data-json="${escapeHtml(`${path}.*.${field}`)}" data-agg="${how}"`, value, digits);
  }

  /** The least or greatest thickness of a layer along the line (difference of the bounding refractors' depths). */
  thickness(layer: number, how: 'min' | 'max', digits: number): string {
    const values = layerThicknesses(this.document, layer);
    const value = values.length === 0 ? undefined : how === 'min' ? minOf(values) : maxOf(values);
    return span(`data-thickness="${layer}" data-agg="${how}"`, value, digits);
  }

  /** Escaped text of a string field. */
  text(path: string): string {
    const value = this.get(path);
    return value === undefined || value === null ? '' : escapeHtml(String(value));
  }
}

function span(source: string, value: number | undefined, digits: number): string {
  if (value === undefined) return `<span class="num" ${source} data-value="null">—</span>`;
  const shown = value.toFixed(digits);
  return `<span class="num" ${source} data-value="${value}" data-digits="${digits}">${shown === `-${(0).toFixed(digits)}` ? (0).toFixed(digits) : shown}</span>`;
}
