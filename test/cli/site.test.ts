import { describe, expect, it } from 'vitest';
import { run, WORKING_NOTES } from './run.js';

describe('hammerline site', () => {
  it('site without standard errors prints no probability, no percentile and no Monte Carlo, and says no uncertainty was given', () => {
    const { code, stdout } = run(['site', '--layer', '4:185', '--layer', '10:430', '--halfspace', '880']);
    expect(code).toBe(0);
    // vs,30 = 30 / (4/185 + 10/430 + 16/880) = 475.7 m/s (EN 1998-1 Eq. 3.1), by hand.
    expect(stdout).toMatch(/Vs30 476 m\/s; no uncertainty was given/);
    expect(stdout).not.toMatch(/Table [\d.-]+ .*\d %/);
    expect(stdout).not.toMatch(/100 %/);
    expect(stdout).not.toMatch(/percentile|Monte Carlo/);
    expect(stdout).toMatch(/ASCE 7-16 +Table 20\.3-1 +\d+ +C +not computed/);
    const doc = JSON.parse(run(['site', '--layer', '4:185', '--layer', '10:430', '--halfspace', '880', '--json']).stdout);
    expect(doc.site.classes.map((c: { probability: unknown }) => c.probability)).toEqual([null, null, null]);
    expect(doc.site.vs30_low_mps).toBeNull();
    expect(doc.site.vs30_interval).toMatch(/^none/);
    expect(doc.site.monte_carlo).toBeNull();
  });

  it('site with standard errors runs the Monte Carlo and gives the percentile range', () => {
    const { stdout } = run(['site', '--layer', '4:185:6', '--layer', '10:430:15', '--halfspace', '880:30']);
    expect(stdout).toMatch(/Vs30 476 m\/s \(5th to 95th percentile \d+ to \d+ m\/s, 4000 Monte Carlo draws, seed 1\)/);
  });

  it('site (a hand-entered, e.g. downhole, profile) gets no refraction caution, and the cautions that apply to it', () => {
    const doc = JSON.parse(run(['site', '--layer', '4:185', '--layer', '10:430', '--halfspace', '880', '--json']).stdout);
    const codes: string[] = doc.site.cautions.map((c: { code: string }) => c.code);
    expect(codes).not.toContain('hidden-soft-layer');
    expect(doc.site.cautions.map((c: { message: string }) => c.message).join(' ')).not.toMatch(/refraction/i);
    expect(codes).toEqual(expect.arrayContaining(['asce7-16-class-f', 'asce7-22-class-f', 'en1998-1-s1-s2', 'vs30-extrapolated', 'professional-judgement']));
  });

  it('site cautions each have their own code', () => {
    const doc = JSON.parse(run(['interpret', 'survey-examples/alluvial-terrace/sh-first-breaks.csv', '--json']).stdout);
    const codes: string[] = doc.site.cautions.map((c: { code: string }) => c.code);
    expect(new Set(codes).size).toBe(codes.length);
  });

  it('site and interpret print no working note on where the values came from (summary, notes, cautions, warnings, JSON)', () => {
    const texts = [
      run(['site', '--layer', '4:185', '--layer', '10:430', '--halfspace', '880']).stdout,
      run(['site', '--layer', '4:185:5', '--halfspace', '880:20', '--estimated', '--json']).stdout,
      run(['interpret', 'survey-examples/alluvial-terrace/sh-first-breaks.csv']).stdout,
      run(['interpret', 'survey-examples/alluvial-terrace/sh-first-breaks.csv', '--json']).stdout,
      run(['interpret', 'survey-examples/pump-station/first-breaks.csv', '--poisson', '0.3']).stdout,
      run(['interpret', 'survey-examples/pump-station/first-breaks.csv', '--poisson', '0.3', '--json']).stdout,
    ];
    for (const text of texts) expect(text).not.toMatch(WORKING_NOTES);
    // The standard, its table and what to confirm are there instead.
    expect(texts[0]).toMatch(/classes by Table 20\.3-1.*Confirm the table against the edition the jurisdiction has adopted/);
  });
});

describe('hammerline COMMAND --help', () => {
  it('each subcommand\'s --help prints its own help, not the whole of hammerline --help', () => {
    const whole = run(['--help']).stdout;
    const own: Record<string, [RegExp, RegExp]> = {
      interpret: [/--poisson NU.*[\s\S]*--layer-poisson N:NU[\s\S]*--p-line FILE\.csv/, /site: classes a hand-entered|report: the report|records: prints/],
      site: [/--layer T:V\[:SE\][\s\S]*--halfspace/, /--segments|--poisson|--bandpass/],
      pick: [/--source-x X[\s\S]*--bandpass/, /--poisson|--halfspace/],
      records: [/records: prints the headers/, /--poisson|--halfspace|--segments/],
      report: [/--pdf FILE\.pdf/, /--halfspace|site: classes/],
    };
    for (const [command, [has, hasNot]] of Object.entries(own)) {
      const { code, stdout } = run([command, '--help']);
      expect(code, command).toBe(0);
      expect(stdout, command).toMatch(has);
      expect(stdout, command).not.toMatch(hasNot);
      expect(stdout.length, command).toBeLessThan(whole.length);
    }
  });
});
