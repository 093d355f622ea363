import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import { processIo, type CliIo } from '../../src/cli/io.js';

const SH = resolve('survey-examples/alluvial-terrace/sh-first-breaks.csv');
const haveTools = existsSync('/usr/bin/chromium') && existsSync('/usr/bin/pdftotext') && existsSync('/usr/bin/pdftoppm') && existsSync('/usr/bin/pdfinfo');
const work = mkdtempSync(join(tmpdir(), 'hammerline-report-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

function quietIo(): CliIo & { err: string[] } {
  const err: string[] = [];
  return { ...processIo, stdout: () => undefined, stderr: (t) => { err.push(t); }, err };
}

const JOB = ['--client', 'Example Holdings (invented)', '--site', 'Orrin valley terrace, school block (invented)', '--line', 'T-2S', '--date', '2026-05-14',
  '--operator', 'A. Field (invented)', '--equipment', '24-channel seismograph, 10 Hz horizontal geophones', '--source-type', 'beam struck at both ends', '--issued', '2026-06-01'];

describe.skipIf(!haveTools)('hammerline report --pdf (Debian chromium, poppler-utils)', () => {
  it('report --pdf on A4 gives 7 to 14 pages whose text holds the site classes and the cautions; page 1 and the figures page kept as PNG', () => {
    const pdf = join(work, 'report.pdf');
    const code = main(['report', SH, '-o', join(work, 'report.html'), '--pdf', pdf, ...JOB], quietIo());
    expect(code).toBe(0);
    const info = execFileSync('pdfinfo', [pdf], { encoding: 'utf8' });
    const pages = Number(/Pages:\s+(\d+)/.exec(info)![1]);
    // 12 sections, two 48-row depth tables: 7 to 14 A4 pages (measured 10 here).
    expect(pages).toBeGreaterThanOrEqual(7);
    expect(pages).toBeLessThanOrEqual(14);
    expect(info).toMatch(/Page size:\s+59[45]\.\d+ x 841\.\d+ pts \(A4\)/); // A4, 210 x 297 mm = 595.3 x 841.9 pt (ISO 216); Chromium rounds to whole CSS pixels
    const text = execFileSync('pdftotext', ['-layout', pdf, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
    // The SH example's true model (survey-examples/README.md: 160 m/s to 2 m, 300 m/s to 11 m,
    // 1050 m/s below) gives vs,30 = 30 / (2/160 + 9/300 + 19/1050) = 495.1 m/s, by hand: ASCE 7-16
    // class C (365.76 to 762 m/s, Table 20.3-1), ASCE 7-22 class C (441.96 to 640.08 m/s, Table
    // 20.2-1), and EN 1998-1 ground type E by the profile (11 m of soil slower than 360 m/s over
    // more than 800 m/s, Table 3.1). The interpreted Vs30 lies within 3 % of the true one.
    const vs30 = Number(/Vs30 (\d+) m\/s, 5th–95th percentile/.exec(text)![1]);
    expect(Math.abs(vs30 - 495.1) / 495.1).toBeLessThan(0.03);
    expect(text).toMatch(/ASCE 7-16 Table 20\.3-1 \d+ 30\.48 C /);
    expect(text).toMatch(/ASCE 7-22 Table 20\.2-1 \d+ 30\.48 C /);
    expect(text).toMatch(/EN 1998-1:2004 Table 3\.1 \d+ 30\.00 E [01]\.\d\d .*by profile shape/);
    expect(text).toMatch(/Cautions and limitations/);
    expect(text).toMatch(/hidden layer/);
    expect(text).toMatch(/Conditions that need borings/);
    expect(text).toMatch(/Local codes and regulations govern/);
    expect(text).toMatch(/Page 1 of \d+/);
    mkdirSync('test-output', { recursive: true });
    execFileSync('pdftoppm', ['-png', '-r', '110', '-f', '1', '-l', '1', '-singlefile', pdf, 'test-output/report-page-1']);
    execFileSync('pdftoppm', ['-png', '-r', '110', '-f', '3', '-l', '3', '-singlefile', pdf, 'test-output/report-page-3']);
    expect(readFileSync('test-output/report-page-1.png').subarray(1, 4).toString('latin1')).toBe('PNG');
  });

  it('report --paper Letter prints on US Letter, 8.5 x 11 in', () => {
    const pdf = join(work, 'letter.pdf');
    expect(main(['report', SH, '--pdf', pdf, '--paper', 'Letter', ...JOB], quietIo())).toBe(0);
    expect(execFileSync('pdfinfo', [pdf], { encoding: 'utf8' })).toMatch(/Page size:\s+612 x 792 pts \(letter\)/);
  });
});

describe('hammerline report --pdf without chromium', () => {
  it('report --pdf stops with exit 2 and the Debian package to install when chromium is missing, and writes nothing', () => {
    const saved = process.env.HAMMERLINE_CHROMIUM;
    process.env.HAMMERLINE_CHROMIUM = join(work, 'no-such-chromium');
    const io = quietIo();
    const html = join(work, 'none.html');
    try {
      expect(main(['report', SH, '-o', html, '--pdf', join(work, 'none.pdf')], io)).toBe(2);
    } finally {
      if (saved === undefined) delete process.env.HAMMERLINE_CHROMIUM;
      else process.env.HAMMERLINE_CHROMIUM = saved;
    }
    expect(io.err.join('')).toMatch(/--pdf needs Chromium to print the report, and .*no-such-chromium does not exist; install it with "sudo apt-get install chromium"/);
    expect(existsSync(html)).toBe(false);
    expect(existsSync(join(work, 'none.pdf'))).toBe(false);
  });

  it('report never writes over an input file: -o naming the first-break table stops with exit 2 and leaves it as it was', () => {
    const input = join(work, 'line.csv');
    writeFileSync(input, readFileSync(SH));
    const io = quietIo();
    expect(main(['report', input, '-o', input], io)).toBe(2);
    expect(io.err.join('')).toMatch(/-o/);
    expect(readFileSync(input)).toEqual(readFileSync(SH));
  });
});
