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
    expect(stdout).toMatch(/Refractor 1 .* depth under each source, intercept-time method/);
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
    expect(doc.refractors[0]).toEqual(expect.objectContaining({ index: 1, method: 'intercept-time' }));
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
