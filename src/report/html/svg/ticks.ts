/**
 * Round-number axis ticks covering [min, max]: steps of 1, 2 or 5 times a power of ten, about
 * `count` of them (Heckbert 1990, "Nice numbers for graph labels", Graphics Gems).
 */
export function niceTicks(min: number, max: number, count = 6): { ticks: number[]; step: number; low: number; high: number } {
  const span = max > min ? max - min : Math.abs(max) || 1;
  const raw = span / Math.max(1, count);
  const power = 10 ** Math.floor(Math.log10(raw));
  const fraction = raw / power;
  const step = (fraction <= 1 ? 1 : fraction <= 2 ? 2 : fraction <= 5 ? 5 : 10) * power;
  const low = Math.floor(min / step + 1e-9) * step;
  const high = Math.ceil(max / step - 1e-9) * step;
  const ticks: number[] = [];
  for (let t = low; t <= high + step * 1e-6; t += step) ticks.push(Number(t.toFixed(10)));
  return { ticks, step, low, high: high > low ? high : low + step };
}

/** Decimals needed to write the ticks of a given step without trailing noise. */
export function tickDigits(step: number): number {
  return Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
}

/** A coordinate for SVG, to 0.1 unit, so output is short and deterministic. */
export function c(value: number): string {
  const text = value.toFixed(1);
  return text === '-0.0' ? '0.0' : text;
}
