import { readFileSync } from 'node:fs';
import { expect } from 'vitest';
import type { CliIo } from '../../src/cli/io.js';
import { reportCommand } from '../../src/cli/report.js';
import { InputError } from '../../src/core/errors.js';

/** Runs `hammerline report` in memory with a fixed issue date and version, so its output is deterministic. */
export function runReport(args: string[], files: Record<string, string> = {}) {
  let stdout = '';
  let stderr = '';
  const written: Record<string, string> = {};
  const io: CliIo = {
    stdout: (t) => { stdout += t; },
    stderr: (t) => { stderr += t; },
    readText: (path) => (path in files ? files[path] : readFileSync(path, 'utf8')),
    readBytes: (path) => (path in files ? new TextEncoder().encode(files[path]) : new Uint8Array(readFileSync(path))),
    writeText: (path, text) => { written[path] = text; },
  };
  let code: number;
  let error: InputError | undefined;
  try {
    code = reportCommand(args[0] === 'report' ? args.slice(1) : args, io, { now: () => '2026-06-01', version: '0.0.0-test' });
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    error = e;
    code = 2;
  }
  return { code, stdout, stderr, written, error };
}

/** Every number the report marks with its source: path in the JSON document, value, decimals shown, text shown. */
export function markedNumbers(html: string) {
  const out: { path?: string; agg?: string; thickness?: number; value: number | null; digits?: number; unit?: string; text: string }[] = [];
  const pattern = /<(?:span|tspan) class="num" ([^>]*)>([^<]*)<\/(?:span|tspan)>/g;
  for (const match of html.matchAll(pattern)) {
    const attrs = Object.fromEntries([...match[1].matchAll(/data-([\w-]+)="([^"]*)"/g)].map((a) => [a[1], a[2]]));
    out.push({
      path: attrs.json?.replace(/&amp;/g, '&'),
      agg: attrs.agg,
      thickness: attrs.thickness === undefined ? undefined : Number(attrs.thickness),
      value: attrs.value === 'null' ? null : Number(attrs.value),
      digits: attrs.digits === undefined ? undefined : Number(attrs.digits),
      unit: attrs.unit,
      text: match[2],
    });
  }
  return out;
}

/** The text of the section with the given id. */
export function section(html: string, id: string): string {
  const start = html.indexOf(`<section id="${id}">`);
  if (start < 0) return '';
  return html.slice(start, html.indexOf('</section>', start));
}

function at(document: unknown, path: string): unknown {
  return path.split('.').reduce<unknown>((node, key) => (node === null || typeof node !== 'object' ? undefined : (node as Record<string, unknown>)[key]), document);
}

/**
 * Compares every number the report marks with the JSON document of interpret() (made by the
 * caller, independently of the report command) and the geophones of the table: the value, and
 * the text shown at the decimals shown. Returns how many were compared.
 */
export function compareWithDocument(html: string, document: Record<string, unknown>, receivers: { x: number; elev: number }[]): number {
  let compared = 0;
  for (const n of markedNumbers(html)) {
    let expected: unknown;
    if (n.thickness !== undefined) {
      // Thickness of layer k: depth to refractor k minus depth to refractor k-1 where both have a point.
      const depth = (k: number) => new Map((at(document, `refractors.${k - 1}.points`) as { x_m: number; depth_m: number }[]).map((p) => [p.x_m, p.depth_m]));
      const base = depth(n.thickness);
      const top = n.thickness > 1 ? depth(n.thickness - 1) : undefined;
      const values = [...base.entries()].filter(([x]) => !top || top.has(x)).map(([x, d]) => d - (top?.get(x) ?? 0));
      expected = n.agg === 'min' ? Math.min(...values) : Math.max(...values);
    } else if (n.path!.startsWith('layout.receivers.')) {
      const [, , i, field] = n.path!.split('.');
      expected = field === 'station' ? Number(i) + 1 : field === 'x_m' ? receivers[Number(i)].x : receivers[Number(i)].elev;
    } else if (n.path!.startsWith('layout.') || n.path!.startsWith('picking.')) {
      continue;
    } else if (n.agg) {
      const [arrayPath, field] = n.path!.split('.*.');
      // Over the points that have a value (null where, for example, a contour is not found).
      const values = (at(document, arrayPath) as Record<string, number | null>[]).map((o) => o[field]).filter((v): v is number => typeof v === 'number');
      expected = n.agg === 'min' ? Math.min(...values) : Math.max(...values);
    } else {
      expected = at(document, n.path!);
    }
    if (expected === null || expected === undefined) {
      expect(n.value, n.path).toBeNull();
      continue;
    }
    expect(n.value, n.path ?? `thickness ${n.thickness}`).toBeCloseTo(expected as number, 9);
    // The text shown is the value at the decimals shown (half a unit in the last place); a value
    // marked as shown in feet is the SI value over 0.3048 (1 ft = 0.3048 m exactly, international
    // yard and pound agreement, 1959), for lengths and velocities alike.
    const shownExpected = n.unit === 'ft' ? (expected as number) / 0.3048 : (expected as number);
    expect(Math.abs(Number(n.text) - shownExpected), `${n.path} shown as ${n.text}`).toBeLessThanOrEqual(0.5 * 10 ** -(n.digits ?? 0) + 1e-9);
    compared++;
  }
  return compared;
}
