import { renderParts, type Quantity, type SiText } from '../core/siText.js';
import { METRES_PER_FOOT, type LengthUnit } from '../core/units.js';

const NUMBER = String.raw`-?\d+(?:\.\d+)?`;
const JOINER = String.raw`(?:, | and | or | to |-)`;
// A number, or a list or range of numbers ("12, 14", "12 and 14", "1450-1650", "1, 2, 3, ..."),
// then a length or velocity unit. The look-behind keeps "S2" and "3.5" from matching midway.
const WITH_UNIT = new RegExp(String.raw`(?<![\w.])(${NUMBER}(?:${JOINER}${NUMBER})*(?:, \.\.\.)?) ?(m\/s|m)(?![\w/])`, 'g');

/**
 * A plain SI sentence with every length and velocity in feet (ft, ft/s), the SI value following
 * in brackets: "a gap of 4.57 m" becomes "a gap of 15.00 ft [4.57 m]". For sentences written
 * without si`` (the command line renders si`` sentences from their quantities).
 */
export function feetInText(text: string): string {
  return text.replace(WITH_UNIT, (whole, numbers: string, unit: string) => {
    const converted = numbers.replace(new RegExp(`(?<![\\w.])${NUMBER}`, 'g'), (n) => {
      const decimals = Math.max(1, Math.min(2, (n.split('.')[1] ?? '').length));
      const feet = Number(n) / METRES_PER_FOOT;
      return unit === 'm/s' ? Math.round(feet).toString() : feet.toFixed(decimals);
    });
    return `${converted} ${unit === 'm/s' ? 'ft/s' : 'ft'} [${numbers} ${unit}]`;
  });
}

/** A warning's or caution's sentence in the display unit. */
export function displayText(item: { message: string; parts?: (string | Quantity)[] } | SiText, unit: LengthUnit): string {
  // Plain text inside an si`` sentence may still carry SI figures (a standard's wording): converted too.
  if (item.parts) return renderParts(unit === 'ft' ? item.parts.map((p) => (typeof p === 'string' ? feetInText(p) : p)) : item.parts, unit);
  const text = 'message' in item ? item.message : item.text;
  return unit === 'ft' ? feetInText(text) : text;
}
