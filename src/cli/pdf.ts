import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { tmpdir } from 'node:os';
import { basename, dirname, join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { InputError } from '../core/errors.js';

/** Where Debian's chromium package installs the browser; HAMMERLINE_CHROMIUM overrides it. */
export const DEFAULT_CHROMIUM = '/usr/bin/chromium';

/** The browser binary to print with. */
export function chromiumPath(): string {
  return process.env.HAMMERLINE_CHROMIUM || DEFAULT_CHROMIUM;
}

/**
 * Throws a clear input error when the browser that prints the PDF is not installed.
 * @throws InputError naming the path looked at and the Debian package to install
 */
export function requireChromium(path = chromiumPath()): void {
  if (!existsSync(path)) {
    throw new InputError({}, `--pdf needs Chromium to print the report, and ${path} does not exist; install it with "sudo apt-get install chromium" (Debian package chromium), or set HAMMERLINE_CHROMIUM to the browser's path; the HTML report can be printed to PDF from any browser instead`);
  }
}

/**
 * Prints a self-contained HTML report to PDF with headless Chromium, in a fresh profile that is
 * deleted afterwards, with background networking, component updates and sync switched off, and
 * writes the PDF whole or not at all: into a temporary file beside the target, then renamed.
 * The page size and margins are those of the report's @page rule.
 *
 * @throws InputError when Chromium is missing; Error when it fails or writes no PDF
 */
export function renderPdf(html: string, target: string, chromium = chromiumPath(), timeoutMs = 120_000): void {
  requireChromium(chromium);
  const work = mkdtempSync(join(tmpdir(), 'hammerline-pdf-'));
  try {
    const page = join(work, 'report.html');
    const printed = join(work, 'report.pdf');
    writeFileSync(page, html);
    const args = [
      '--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update',
      '--disable-sync', '--disable-extensions', '--disable-default-apps', '--no-first-run', '--no-default-browser-check',
      '--no-pdf-header-footer', `--user-data-dir=${join(work, 'profile')}`, `--print-to-pdf=${printed}`, pathToFileURL(page).href,
    ];
    const run = spawnSync(chromium, args, { timeout: timeoutMs, encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
    if (run.error) throw new Error(`Chromium (${chromium}) could not print the report: ${run.error.message}`);
    const pdf = existsSync(printed) ? readFileSync(printed) : undefined;
    if (pdf === undefined || pdf.subarray(0, 5).toString('latin1') !== '%PDF-') {
      throw new Error(`Chromium (${chromium}) wrote no PDF (exit status ${run.status}): ${(run.stderr ?? '').split('\n').filter(Boolean).slice(-3).join(' / ')}`);
    }
    const temporary = join(dirname(target), `.${basename(target)}.${randomBytes(4).toString('hex')}.tmp`);
    try {
      writeFileSync(temporary, pdf);
      renameSync(temporary, target);
    } catch (error) {
      rmSync(temporary, { force: true });
      throw error;
    }
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}
