import { escapeHtml } from './escape.js';
import { minOf, maxOf } from '../../core/extent.js';
import { METRES_PER_FOOT, seDecimals, type LengthUnit } from '../../core/units.js';
import { feetInText } from '../unitText.js';

/** What a document path holds, by the unit its field name ends in (`_m` metres, `_mps` m/s). */
export function quantityOf(path: string): 'length' | 'velocity' | undefined {
  const field = path.split('.').pop() ?? '';
  return field.endsWith('_mps') ? 'velocity' : field.endsWith('_m') ? 'length' : undefined;
}

/**
 * Decimals of a length or velocity shown in feet for `digits` decimals in SI: a position or depth
 * given to the centimetre (2 decimals) is shown to the tenth of a foot (3 cm, the practice of
 * US geotechnical logs), anything coarser keeps its decimals.
 */
export function feetDigits(digits: number): number {
  return digits >= 2 ? digits - 1 : digits;
}

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
  /** The unit lengths and velocities are written in now (see `withUnit`). */
  private shown: LengthUnit;

  /**
   * @param unit - the unit of the report: lengths and velocities (document fields ending in `_m`
   *   and `_mps`) are shown in feet and ft/s when 'ft', the SI value kept in data-value
   */
  constructor(readonly document: Record<string, unknown>, readonly unit: LengthUnit = 'm') {
    this.shown = unit;
  }

  /** Label of lengths in the report's unit ("m" or "ft"). */
  get lengthLabel(): string {
    return this.unit === 'ft' ? 'ft' : 'm';
  }

  /** Label of velocities in the report's unit ("m/s" or "ft/s"). */
  get velocityLabel(): string {
    return this.unit === 'ft' ? 'ft/s' : 'm/s';
  }

  /**
   * A figure of text with its unit: `render` writes the numbers (through num, pm, agg,
   * thickness), then the unit follows. In feet the SI rendering follows in brackets:
   * "19.7 to 20.3 ft [6.0 to 6.2 m]".
   */
  withUnit(kind: 'length' | 'velocity', render: () => string): string {
    const si = kind === 'length' ? 'm' : 'm/s';
    if (this.unit === 'm') return `${render()} ${si}`;
    const feet = render();
    this.shown = 'm';
    try {
      return `${feet} ${kind === 'length' ? 'ft' : 'ft/s'} [${render()} ${si}]`;
    } finally {
      this.shown = this.unit;
    }
  }

  /** A length or velocity in metres (m/s) computed here, not read from the document, in the report's unit (text, no span). */
  plain(kind: 'length' | 'velocity', si: number | number[], digits: number, joiner = ', '): string {
    const values = Array.isArray(si) ? si : [si];
    const write = (list: number[], d: number) => list.map((v) => fixed(v, d)).join(joiner);
    const siText = `${write(values, digits)} ${kind === 'length' ? 'm' : 'm/s'}`;
    if (this.unit === 'm') return siText;
    return `${write(values.map((v) => v / METRES_PER_FOOT), feetDigits(digits))} ${kind === 'length' ? 'ft' : 'ft/s'} [${siText}]`;
  }

  /**
   * A plain SI sentence of the document (a start model, a parameter, a standard's wording) in the
   * report's unit: in feet every length and velocity is converted, the SI value in brackets. A
   * velocity gradient in m/s per metre is the same number in ft/s per foot.
   */
  sentence(text: string): string {
    if (this.unit === 'm') return text;
    return feetInText(text).replace(/-?\d+(?:\.\d+)? ft\/s \[(-?\d+(?:\.\d+)?) m\/s\] per metre( of depth)?/g, (_, g: string, depth: string | undefined) => `${g} ft/s per foot${depth ?? ''} [${g} m/s per metre]`);
  }

  /** The span of a value of the document (SI) in the unit shown now, for a field of the given kind. */
  private mark(source: string, value: number | undefined, digits: number, kind: 'length' | 'velocity' | undefined): string {
    if (kind === undefined || this.shown === 'm') return span(source, value, digits);
    return span(`${source} data-unit="ft"`, value, feetDigits(digits), value === undefined ? undefined : value / METRES_PER_FOOT);
  }

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
    return this.mark(`data-json="${escapeHtml(path)}"`, value, digits, quantityOf(path));
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
    return this.mark(`data-json="${escapeHtml(`${path}.*.${field}`)}" data-agg="${how}"`, value, digits, quantityOf(field));
  }

  /** The least or greatest thickness of a layer along the line (difference of the bounding refractors' depths). */
  thickness(layer: number, how: 'min' | 'max', digits: number): string {
    const values = layerThicknesses(this.document, layer);
    const value = values.length === 0 ? undefined : how === 'min' ? minOf(values) : maxOf(values);
    return this.mark(`data-thickness="${layer}" data-agg="${how}"`, value, digits, 'length');
  }

  /** Escaped text of a string field. */
  text(path: string): string {
    const value = this.get(path);
    return value === undefined || value === null ? '' : escapeHtml(String(value));
  }
}

/** `value` (from the document) in a marked span; `shownValue` is what is written when it differs (the value in feet). */
function span(source: string, value: number | undefined, digits: number, shownValue = value): string {
  if (value === undefined) return `<span class="num" ${source} data-value="null">—</span>`;
  return `<span class="num" ${source} data-value="${value}" data-digits="${digits}">${fixed(shownValue!, digits)}</span>`;
}

/** toFixed without a negative zero. */
function fixed(value: number, digits: number): string {
  const shown = value.toFixed(digits);
  return shown === `-${(0).toFixed(digits)}` ? (0).toFixed(digits) : shown;
}
