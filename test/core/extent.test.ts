import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { maxOf, minOf, pushAll } from '../../src/core/extent.js';

function sourceFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    return statSync(path).isDirectory() ? sourceFiles(path) : path.endsWith('.ts') ? [path] : [];
  });
}

describe('minOf, maxOf, pushAll', () => {
  it('minOf and maxOf of 500 000 values give the extremes where Math.min(...values) overflows the call stack', () => {
    const values = Float64Array.from({ length: 500_000 }, (_, i) => Math.sin(i) * 1000);
    values[123_456] = -2000;
    values[400_000] = 3000;
    expect(minOf(values)).toBe(-2000);
    expect(maxOf(values)).toBe(3000);
    // The fault these replace (V8 passes spread arguments on the stack).
    expect(() => Math.min(...Array.from(values))).toThrow(RangeError);
    expect(minOf([])).toBe(Infinity);
    expect(maxOf([])).toBe(-Infinity);
    expect(Number.isNaN(minOf([1, NaN, 0]))).toBe(true);
    expect(pushAll([1], Array.from({ length: 300_000 }, (_, i) => i)).length).toBe(300_001);
  });

  it('no file of src/ spreads an array into a function call (Math.min(...x), push(...x))', () => {
    const offenders: string[] = [];
    for (const file of sourceFiles('src')) {
      readFileSync(file, 'utf8').split('\n').forEach((line, i) => {
        const code = line.replace(/\/\/.*$/, '').replace(/^\s*(\/\*\*|\*).*$/, '');
        if (/[\w$\])]\(\s*\.\.\.|,\s*\.\.\.[\w$.]+\s*\)/.test(code)) offenders.push(`${file}:${i + 1}: ${line.trim()}`);
      });
    }
    expect(offenders).toEqual([]);
  });
});
