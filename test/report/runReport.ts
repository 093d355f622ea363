import { readFileSync } from 'node:fs';
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
  const out: { path?: string; agg?: string; thickness?: number; value: number | null; digits?: number; text: string }[] = [];
  const pattern = /<(?:span|tspan) class="num" ([^>]*)>([^<]*)<\/(?:span|tspan)>/g;
  for (const match of html.matchAll(pattern)) {
    const attrs = Object.fromEntries([...match[1].matchAll(/data-([\w-]+)="([^"]*)"/g)].map((a) => [a[1], a[2]]));
    out.push({
      path: attrs.json?.replace(/&amp;/g, '&'),
      agg: attrs.agg,
      thickness: attrs.thickness === undefined ? undefined : Number(attrs.thickness),
      value: attrs.value === 'null' ? null : Number(attrs.value),
      digits: attrs.digits === undefined ? undefined : Number(attrs.digits),
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
