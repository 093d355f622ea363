import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import type { CliIo } from '../../src/cli/io.js';

const example = 'survey-examples/pump-station/first-breaks.csv';

function run(argv: string[], files: Record<string, string> = {}) {
  let stdout = '';
  let stderr = '';
  const written: Record<string, string> = {};
  const io: CliIo = {
    stdout: (t) => { stdout += t; },
    stderr: (t) => { stderr += t; },
    readText: (path) => {
      if (path in files) return files[path];
      return readFileSync(path, 'utf8');
    },
    readBytes: (path) => (path in files ? new TextEncoder().encode(files[path]) : new Uint8Array(readFileSync(path))),
    writeText: (path, text) => { written[path] = text; },
  };
  const code = main(argv, io);
  return { code, stdout, stderr, written };
}

describe('hammerline interpret', () => {
  it('interpret prints layers with standard errors, depths, warnings and cautions, exit 0', () => {
    const { code, stdout } = run(['interpret', example]);
    expect(code).toBe(0);
    expect(stdout).toMatch(/velocity \(m\/s\)/);
    expect(stdout).toMatch(/\d+ ± \d+/);
    expect(stdout).toMatch(/Refractor 1 .* depth below ground by geophone; recommended: /);
    expect(stdout).toMatch(/Under the sources \(intercept-time\): S1 \d+\.\d+ ± \d+\.\d+ m/);
    expect(stdout).toMatch(/Reciprocal times: \d+ pairs checked/);
    expect(stdout).toMatch(/Cautions/);
    expect(stdout).toMatch(/hidden layer/);
  });

  it('interpret --json writes the stable fields of the DESIGN.md contract', () => {
    const { code, stdout } = run(['interpret', example, '--json']);
    expect(code).toBe(0);
    const doc = JSON.parse(stdout);
    expect(doc.schema).toBe('hammerline/interpretation@1');
    expect(doc.wave).toBe('P');
    expect(doc.layers[0]).toEqual(expect.objectContaining({ index: 1, velocity_mps: expect.any(Number), velocity_se_mps: expect.any(Number) }));
    expect(doc.refractors[0]).toEqual(expect.objectContaining({ index: 1, method: expect.stringMatching(/inversion|GRM|delay-time/) }));
    expect(Object.keys(doc.refractors[0].by_method).filter((m) => m !== 'inversion').sort()).toEqual(['GRM', 'delay-time', 'intercept-time', 'plus-minus']);
    expect(doc.qc.inversion).toEqual(expect.objectContaining({ kept: expect.any(Boolean), rms_before_ms: expect.any(Number), rms_after_ms: expect.any(Number), iterations: expect.any(Number), reason: expect.any(String) }));
    // One point per geophone: the pump-station line has 48 (survey-examples/pump-station/README.md).
    expect(doc.refractors[0].points).toHaveLength(48);
    expect(doc.qc.reciprocal.length).toBeGreaterThan(0);
    expect(doc.refractors[0].points[0]).toEqual(expect.objectContaining({ x_m: expect.any(Number), depth_m: expect.any(Number), elev_m: expect.any(Number), depth_se_m: expect.any(Number) }));
    expect(doc.qc.fit_rms_ms).toBeGreaterThan(0);
    expect(Array.isArray(doc.warnings)).toBe(true);
  });

  it('interpret --json with several files prints an array, one document per file, and progress on stderr', () => {
    const { stdout, stderr } = run(['interpret', example, 'survey-examples/alluvial-terrace/first-breaks.csv', '--json']);
    const docs = JSON.parse(stdout);
    expect(docs).toHaveLength(2);
    expect(stderr).toMatch(/\[2\/2\]/);
  });

  it('interpret --units ft reads feet and shows ft and ft/s', () => {
    const csv = readFileSync(example, 'utf8');
    const { code, stdout } = run(['interpret', 'feet.csv', '--units', 'ft'], { 'feet.csv': csv });
    expect(code).toBe(0);
    expect(stdout).toMatch(/velocity \(ft\/s\)/);
    expect(stdout).toMatch(/depth \(ft\)/);
  });

  it('interpret exits 2 with the message on stderr for bad input, and names the file', () => {
    const { code, stderr, stdout } = run(['interpret', 'bad.csv'], { 'bad.csv': 'source_x,receiver_x\n0,1\n' });
    expect(code).toBe(2);
    expect(stdout).toBe('');
    expect(stderr).toMatch(/^hammerline: bad\.csv, row 1: missing required column time_ms/);
    expect(stderr).not.toMatch(/at .*\.ts:\d+/);
  });

  it('interpret exits 2 for an unreadable file, an unknown option or an unknown branch', () => {
    expect(run(['interpret', 'no/such/file.csv']).stderr).toMatch(/no\/such\/file\.csv: cannot be read \(ENOENT\)/);
    expect(run(['interpret', example, '--colour']).code).toBe(2);
    expect(run(['interpret', example, '--segments', 'S9:forward=2']).stderr).toMatch(/no branch named S9:forward/);
  });

  it('interpret -o writes the output file whole through the atomic writer', () => {
    const { code, written, stdout } = run(['interpret', example, '--json', '-o', 'out.json']);
    expect(code).toBe(0);
    expect(stdout).toBe('');
    expect(JSON.parse(written['out.json']).schema).toBe('hammerline/interpretation@1');
  });

  it('interpret --depths writes the depth table by geophone with its cautions above the header', () => {
    const { code, written } = run(['interpret', example, '--depths', 'depths.csv']);
    expect(code).toBe(0);
    const lines = written['depths.csv'].trim().split('\n');
    // Comment lines are one cell each, quoted where the text holds a comma (io/csvCell.ts).
    expect(lines.filter((l) => /^"?# caution:/.test(l)).length).toBeGreaterThanOrEqual(3);
    const table = lines.filter((l) => !/^"?#/.test(l));
    expect(table[0]).toBe('x,ground_elev,depth_1,depth_1_se,elev_1,method_1');
    // 48 geophones (survey-examples/pump-station/README.md), each with a depth, within 0.3 m of the true
    // model's 4.5 + 2x/94 m.
    expect(table).toHaveLength(49);
    for (const row of table.slice(1)) {
      const [x, , depth] = row.split(',').map(Number);
      expect(Math.abs(depth - (4.5 + (2 * x) / 94))).toBeLessThan(0.3);
    }
    expect(run(['interpret', example, example, '--depths', 'd.csv']).stderr).toMatch(/--depths writes the depth table of one line/);
  });

  it('interpret --segments fixes a branch and the JSON says the user chose it', () => {
    const doc = JSON.parse(run(['interpret', example, '--json', '--segments', 'S2:forward=1']).stdout);
    const branch = doc.branches.find((b: { source_id: string; side: string }) => b.source_id === 'S2' && b.side === 'forward');
    expect(branch.segments).toHaveLength(1);
    expect(branch.segments_chosen_by).toBe('user');
  });
});

describe('bin/hammerline', () => {
  it('bin/hammerline --help runs from the built program and exits 0', () => {
    execFileSync('npm', ['run', 'build', '--silent'], { stdio: 'ignore' });
    const out = execFileSync('node', ['bin/hammerline.js', '--help'], { encoding: 'utf8' });
    expect(out).toMatch(/Usage:/);
  });

  it('bin/hammerline exits 2 on bad input with no stack trace, and an output file is never half-written', () => {
    const dir = mkdtempSync(join(tmpdir(), 'hammerline-'));
    const bad = join(dir, 'bad.csv');
    writeFileSync(bad, 'source_x,receiver_x,time_ms\n0,1,-3\n');
    const target = join(dir, 'out.json');
    writeFileSync(target, 'good');
    const result = spawnSync('node', ['bin/hammerline.js', 'interpret', bad, '--json', '-o', target], { encoding: 'utf8' });
    expect(result.status).toBe(2);
    expect(result.stderr).toMatch(/negative time/);
    expect(result.stderr).not.toMatch(/\n\s+at /);
    expect(readFileSync(target, 'utf8')).toBe('good');
  });
});

describe('hammerline site and the site section of interpret', () => {
  it('site --layer 4:185 --layer 10:430 --halfspace 880 gives Vs30 475.7 m/s and its classes', () => {
    // Vs30 = 30 / (4/185 + 10/430 + 16/880) = 475.7 m/s, ASCE 7-16 Eq. 20.4-1 (STYLE.md example), by hand.
    const { code, stdout } = run(['site', '--layer', '4:185', '--layer', '10:430', '--halfspace', '880', '--json']);
    expect(code).toBe(0);
    const doc = JSON.parse(stdout);
    expect(doc.site.vs30_mps).toBeCloseTo(475.7, 1);
    // ASCE over 100 ft: 30.48/(4/185 + 10/430 + 16.48/880) = 479.4 m/s = 1573 ft/s: 7-16 C, 7-22 C;
    // EN 1998-1: 14 m of soil at 312 m/s over 880 m/s, so ground type E by profile shape.
    expect(doc.site.classes.map((c: { class: string }) => c.class)).toEqual(['C', 'C', 'E']);
    expect(doc.site.extrapolated_m).toBeCloseTo(16, 9);
  });

  it('site --units ft reads feet and ft/s: 20 ft @ 600, 30 ft @ 1000, 50 ft @ 2000 ft/s is 7-16 D and 7-22 CD', () => {
    const { stdout } = run(['site', '--units', 'ft', '--layer', '20:600', '--layer', '30:1000', '--layer', '50:2000', '--json']);
    const doc = JSON.parse(stdout);
    const asce = doc.site.classes.filter((c: { standard: string }) => c.standard.startsWith('ASCE'));
    // 100 / (20/600 + 30/1000 + 50/2000) = 1132.1 ft/s (SITE-CLASSES.md check value), by hand.
    expect(asce[0].average_velocity_mps / 0.3048).toBeCloseTo(1132.1, 0);
    expect(asce.map((c: { class: string }) => c.class)).toEqual(['D', 'CD']);
  });

  it('site of 8 m @ 200 and 12 m @ 400 m/s extends the deepest velocity and gives 7-22 CD', () => {
    const doc = JSON.parse(run(['site', '--layer', '8:200', '--layer', '12:400', '--json']).stdout);
    expect(doc.site.vs30_mps).toBeCloseTo(315.8, 1);
    expect(doc.site.extrapolated_m).toBeCloseTo(10, 9);
    expect(doc.site.classes[1].class).toBe('CD');
  });

  it('site --estimated reports the ASCE 7-22 classes of v̄s/1.3, v̄s and 1.3 v̄s and labels the classes estimated', () => {
    // 1100 ft/s throughout: 846, 1100 and 1430 ft/s give D, CD, CD (SITE-CLASSES.md; factor 1.3 from memory).
    const doc = JSON.parse(run(['site', '--units', 'ft', '--layer', '100:1100', '--estimated', '--json']).stdout);
    const asce22 = doc.site.classes[1];
    expect([asce22.estimated_range.low.class, asce22.estimated_range.central.class, asce22.estimated_range.high.class]).toEqual(['D', 'CD', 'CD']);
    expect(asce22.estimated).toBe(true);
  });

  it('site rejects a malformed layer with a message saying what was expected', () => {
    const { code, stderr } = run(['site', '--layer', '4-185']);
    expect(code).toBe(2);
    expect(stderr).toMatch(/--layer 4-185: expected THICKNESS:VELOCITY/);
  });

  it('interpret of the SH example prints Vs30 with its range and every class with its probability and cautions', () => {
    const { code, stdout } = run(['interpret', 'survey-examples/alluvial-terrace/sh-first-breaks.csv']);
    expect(code).toBe(0);
    expect(stdout).toMatch(/Site class, from measured shear-wave velocities/);
    expect(stdout).toMatch(/Vs30 \d+ m\/s \(5th to 95th percentile \d+ to \d+ m\/s/);
    expect(stdout).toMatch(/ASCE 7-16 +Table 20\.3-1 +\d+ +C +\d+ %/);
    expect(stdout).toMatch(/Class F/);
  });

  it('interpret --poisson labels a P-line site class estimated; --p-line rejects a P line slower than the S line', () => {
    const p = run(['interpret', 'survey-examples/pump-station/first-breaks.csv', '--poisson', '0.3', '--json']);
    const doc = JSON.parse(p.stdout);
    expect(doc.site.estimated_from_vp).toBe(true);
    const swapped = run(['interpret', 'survey-examples/pump-station/first-breaks.csv', '--wave', 'S', '--p-line', 'survey-examples/alluvial-terrace/sh-first-breaks.csv']);
    expect(swapped.code).toBe(2);
    expect(swapped.stderr).toMatch(/not slower than Vp/);
  });
});

describe('hammerline pick, records, and interpret of SEG-2 records', () => {
  const records = [1, 2, 3, 4, 5, 6, 7].map((k) => `survey-examples/pump-station/records/S${k}.seg2`);

  it('records summarises headers and geometry, and --json gives the same as data', () => {
    const text = run(['records', records[2]]);
    expect(text.code).toBe(0);
    expect(text.stdout).toMatch(/48 traces, format code 2, 600 samples at 0\.25 ms, first sample at -5 ms/);
    expect(text.stdout).toMatch(/dead traces: 17/);
    const doc = JSON.parse(run(['records', records[2], '--json']).stdout);
    expect(doc.source_x_m).toEqual([23]);
    expect(doc.receiver_x_m).toEqual({ first: 0, last: 94, count: 48 });
  });

  it('pick writes the first-break table with confidence, source file and trace, and reports the unpicked dead trace', () => {
    const { code, stdout, stderr } = run(['pick', records[2]]);
    expect(code).toBe(0);
    const [header, ...rows] = stdout.trim().split('\n');
    expect(header).toBe('source_id,source_x,source_elev,receiver_x,receiver_elev,time_ms,confidence,source_file,trace');
    expect(rows).toHaveLength(47);
    expect(stderr).toMatch(/S3\.seg2: 1 trace not picked \(dead: 17\)/);
  });

  it('interpret of the seven invented SEG-2 records finds the pump-station model (450 over 2600 m/s, rock 4.5 to 6.5 m)', () => {
    // The true model of survey-examples/pump-station/README.md; the records were made from it with
    // the independent forward model, so this checks picking and interpretation end to end.
    const { code, stdout } = run(['interpret', ...records, '--json', '-q']);
    expect(code).toBe(0);
    const doc = JSON.parse(stdout);
    expect(doc.layers.map((l: { velocity_mps: number }) => l.velocity_mps)).toEqual([expect.closeTo(450, -1.5), expect.closeTo(2600, -2)]);
    const points = doc.refractors[0].points as { x_m: number; depth_m: number }[];
    const mae = points.reduce((a, p) => a + Math.abs(p.depth_m - (4.5 + (2 * p.x_m) / 94)), 0) / points.length;
    expect(mae).toBeLessThan(0.3);
  });

  it('pick names file, trace and field when geometry is missing, and --first-receiver/--spacing and --stations supply it', () => {
    const bytes = readFileSync(records[0]);
    const dir = mkdtempSync(join(tmpdir(), 'hammerline-'));
    // A copy of the record with its location keywords renamed, so that the headers carry no geometry.
    const stripped = Buffer.from(bytes.toString('latin1').replace(/SOURCE_LOCATION/g, 'SOURCE_LOCATIOX').replace(/RECEIVER_LOCATION/g, 'RECEIVER_LOCATIOX'), 'latin1');
    const file = join(dir, 'bare.seg2');
    writeFileSync(file, stripped);
    const missing = run(['pick', file]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/bare\.seg2, trace 1, column SOURCE_LOCATION: no SOURCE_LOCATION/);
    const stations = join(dir, 'stations.csv');
    writeFileSync(stations, 'station,x,elev\n' + Array.from({ length: 48 }, (_, i) => `${101 + i},${2 * i},${(212 - 0.03 * i).toFixed(2)}`).join('\n') + '\n');
    const given = run(['pick', file, '--source-x=-6', '--first-receiver', '0', '--spacing', '2', '--stations', stations]);
    expect(run(['pick', file, '--source-x', '-6']).stderr).toMatch(/--source-x: a value starting with "-" must be joined with "="/);
    expect(given.code).toBe(0);
    const tenth = given.stdout.trim().split('\n').slice(1).map((r) => r.split(',')).find((r) => r[8] === '10')!;
    // Channel 10 is at x = 0 + (10 - 1) × 2 = 18 m; its elevation comes from the station table
    // (212 - 0.03 × 9 = 211.73 m), and the source's from the table's end value beyond x = 0.
    expect(tenth.slice(1, 5)).toEqual(['-6', '212', '18', '211.73']);
  });

  it('pick --bandpass filters before picking, and rejects corners that are not below Nyquist or not increasing', () => {
    const filtered = run(['pick', records[3], '--bandpass', '10,400']);
    expect(filtered.code).toBe(0);
    expect(filtered.stdout.trim().split('\n').length).toBeGreaterThan(40);
    // 0.25 ms sampling: Nyquist is 2000 Hz (FORMAT.md: SAMPLE_INTERVAL; the records' README).
    expect(run(['pick', records[3], '--bandpass', '10,2500']).stderr).toMatch(/must satisfy 0 ≤ low < high < 2000 Hz/);
    expect(run(['pick', records[3], '--bandpass', '10']).stderr).toMatch(/expected LOW,HIGH in Hz/);
  });

  it('interpret refuses a mix of SEG-2 records and first-break tables', () => {
    expect(run(['interpret', records[0], example]).stderr).toMatch(/is a first-break table given with SEG-2 records/);
  });
});
