import { describe, expect, it } from 'vitest';
import { jobFromOptions, missingJobDetails, readJobDetails } from '../../src/io/jobDetails.js';
import { runReport } from './runReport.js';

const SH = 'survey-examples/alluvial-terrace/sh-first-breaks.csv';

describe('job details', () => {
  it('readJobDetails reads "key: value" text (comments, case and spaces ignored) and JSON to the same details', () => {
    const text = readJobDetails('# job of an invented line\nClient: Example Holdings\nsource type: sledgehammer, 8 blows\nline_start: 7.4312, 46.9487\nline_end: 7.4321,46.9490\ndate: 2026-05-14\ngeophone spacing: 1.5\n', 'job.txt');
    const json = readJobDetails(JSON.stringify({ client: 'Example Holdings', source_type: 'sledgehammer, 8 blows', line_start: [7.4312, 46.9487], line_end: '7.4321,46.9490', date: '2026-05-14', geophone_spacing_m: 1.5 }), 'job.json');
    expect(text).toEqual(json);
    expect(text).toEqual({ client: 'Example Holdings', sourceType: 'sledgehammer, 8 blows', lineStart: { lon: 7.4312, lat: 46.9487 }, lineEnd: { lon: 7.4321, lat: 46.949 }, date: '2026-05-14', geophoneSpacing: 1.5 });
  });

  it('readJobDetails names the file, line and field of a bad value and says what was expected', () => {
    expect(() => readJobDetails('client: A\nclinet: B\n', 'job.txt')).toThrow(/job\.txt, line 2: unknown field "clinet"; expected one of client, project, site/);
    expect(() => readJobDetails('date: 2026-02-30\n', 'job.txt')).toThrow(/job\.txt, line 1: field "date" is "2026-02-30"; expected a date written YYYY-MM-DD/);
    expect(() => readJobDetails('line_start: 46.9487,97.4312\n', 'job.txt')).toThrow(/field "line_start" .* expected a latitude from -90 to 90 degrees second \(got 97\.4312\); longitude comes first/);
    expect(() => readJobDetails('line_end: 200,10\n', 'job.txt')).toThrow(/field "line_end" .* expected a longitude from -180 to 180/);
    expect(() => readJobDetails('site: A\nsite: B\n', 'job.txt')).toThrow(/line 2: field "site" is given twice/);
    expect(() => readJobDetails('{"client": 3}', 'job.json')).toThrow(/job\.json: field "client" is 3; expected text/);
    expect(() => readJobDetails('{"client": "A",}', 'job.json')).toThrow(/job\.json: is not valid JSON/);
    expect(() => readJobDetails('{"geophone_spacing_m": -2}', 'job.json')).toThrow(/field "geophone_spacing_m" is -2; expected a spacing in metres above 0/);
    expect(() => readJobDetails('operator: A\u0007B\n', 'job.txt')).toThrow(/expected one line of text without control characters/);
  });

  it('jobFromOptions: an option replaces the sidecar field; missingJobDetails lists what a reviewer expects in report order', () => {
    const job = jobFromOptions({ client: 'From the option', 'geophone-spacing': '5' }, { client: 'From the file', site: 'Terrace' }, (ft) => ft * 0.3048);
    expect(job.client).toBe('From the option');
    expect(job.geophoneSpacing).toBeCloseTo(1.524, 12); // 5 ft, international foot 0.3048 m exactly
    expect(missingJobDetails(job)).toEqual(['Line', 'Date of survey', 'Field operator', 'Equipment', 'Seismic source', 'First geophone coordinates', 'Last geophone coordinates']);
  });

  it('report lists missing job details in the report and on stderr, and takes a sidecar file, checksummed in the history', () => {
    const job = 'client: Example Holdings\nsite: Orrin valley terrace\nline: T-2S\ndate: 2026-05-14\n';
    const r = runReport(['report', SH, '-o', 'r.html', '--job', 'job.txt', '--operator', 'A. Field'], { 'job.txt': job });
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/the report lists as not supplied: Equipment; Seismic source; First geophone coordinates; Last geophone coordinates; Elevation datum \(of the ground elevations supplied\)/);
    const html = r.written['r.html'];
    expect(html).toMatch(/Details a reviewer would expect that were not supplied:<\/strong> Equipment; Seismic source; First geophone coordinates; Last geophone coordinates; Elevation datum \(of the ground elevations supplied\)\./);
    expect(html).toMatch(/<th scope="row">Field operator<\/th><td>A\. Field<\/td>/);
    // SHA-256 of the sidecar's bytes, computed by `printf 'client: Example Holdings\nsite: Orrin valley terrace\nline: T-2S\ndate: 2026-05-14\n' | sha256sum`.
    expect(html).toContain('<td class="file">job.txt</td><td>job details</td><td class="n">80</td><td class="hash">');
    expect(html).toMatch(new RegExp(`<td class="file">job.txt</td><td>job details</td><td class="n">80</td><td class="hash">${SIDECAR_SHA256}</td>`));
  });

  it('report with a bad sidecar stops, exit 2, naming the field, and writes nothing', () => {
    const r = runReport(['report', SH, '-o', 'r.html', '--job', 'job.txt'], { 'job.txt': 'date: 14/05/2026\n' });
    expect(r.code).toBe(2);
    expect(r.error?.message).toMatch(/job\.txt, line 1: field "date"/);
    expect(r.written).toEqual({});
  });
});

const SIDECAR_SHA256 = 'c6989591db96f91e01b45e635c22d334ce8de64e22f9519ab6d9801e43e1e711';
