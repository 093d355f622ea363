import { formatSe, fromMetres, type LengthUnit } from '../../src/core/units.js';

/** Length in the display unit, with its unit. */
export function length(metres: number | undefined, unit: LengthUnit, digits = 1): string {
  return metres === undefined || !Number.isFinite(metres) ? '–' : `${fromMetres(metres, unit).toFixed(digits)} ${unit}`;
}

/** Length in the display unit, without the unit (for table cells under a unit heading). */
export function lengthValue(metres: number | undefined, unit: LengthUnit, digits = 1): string {
  return metres === undefined || !Number.isFinite(metres) ? '–' : fromMetres(metres, unit).toFixed(digits);
}

export function velocityUnit(unit: LengthUnit): string {
  return unit === 'ft' ? 'ft/s' : 'm/s';
}

/** Velocity with its standard error, rounded to whole units. */
export function velocity(mps: number | undefined, se: number | undefined, unit: LengthUnit): string {
  if (mps === undefined || !Number.isFinite(mps)) return '–';
  const v = Math.round(fromMetres(mps, unit));
  return se === undefined || !Number.isFinite(se) ? `${v} ${velocityUnit(unit)}` : `${v} ± ${formatSe(fromMetres(se, unit), 0)} ${velocityUnit(unit)}`;
}

export function ms(seconds: number | undefined, digits = 2): string {
  return seconds === undefined || !Number.isFinite(seconds) ? '–' : `${(seconds * 1e3).toFixed(digits)} ms`;
}

export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

/** Creates an element with attributes and children (text or elements). */
export function el<K extends keyof HTMLElementTagNameMap>(tag: K, attributes: Record<string, string> = {}, ...children: (Node | string)[]): HTMLElementTagNameMap[K] {
  const element = document.createElement(tag);
  for (const [name, value] of Object.entries(attributes)) element.setAttribute(name, value);
  for (const child of children) element.append(child);
  return element;
}
