/**
 * Sweep of estimated site classes over random water-table lines (test/reference/realisticLines.ts:
 * dry soil over saturated soil over rock, the independent forward model with seeded pick noise),
 * Vs estimated from Vp with one Poisson's ratio for every layer. Not a test; run with
 *   nice npx tsx test/reference/sweep/siteSweep.ts [lines=25] [firstSeed=1] [poisson=0.3] [--cli] [--dry] [--verbose]
 * --cli runs each line's first-break table through the command line (interpret --json) instead
 * of calling interpret directly; --dry draws two-layer lines (dry soil over rock, no water table)
 * instead, to count how often the hidden-saturated caution fires where there is none. Counts,
 * among the lines that got a class:
 *   rock by estimate: the estimated v̄s lies in a rock class (ASCE 7-16/7-22 A or B, EN 1998-1 A);
 *   rock reported: a rock class is what the user is shown (the class field itself is A or B);
 *   lost water table: the fit has no layer in the saturated band although the line has one.
 */
import { WarningLog } from '../../../src/core/warnings.js';
import { readFirstBreaks } from '../../../src/io/firstBreaksCsv.js';
import { interpret } from '../../../src/interpret.js';
import { run } from '../../cli/run.js';
import { realisticCsv, realisticLine } from '../realisticLines.js';

const args = process.argv.slice(2).filter((a) => !a.startsWith('--'));
const verbose = process.argv.includes('--verbose');
const cli = process.argv.includes('--cli');
const kind = process.argv.includes('--dry') ? 'two' : 'water-table';
const lines = Number(args[0] ?? 25);
const first = Number(args[1] ?? 1);
const poisson = Number(args[2] ?? 0.3);

interface Found { standard: string; class: string; byEstimate: string }
const ROCK: Record<string, string[]> = { 'ASCE 7-16': ['A', 'B'], 'ASCE 7-22': ['A', 'B'], 'EN 1998-1:2004': ['A'] };
let classed = 0;
let refused = 0;
let none = 0;
let rockByEstimate = 0;
let rockReported = 0;
let lost = 0;
let hiddenCaution = 0;
let lostWithCaution = 0;
for (let seed = first; seed < first + lines; seed++) {
  const line = realisticLine(seed, { layers: kind });
  const csv = realisticCsv(line, seed);
  let velocities: number[];
  let classes: Found[] | undefined;
  let codes: string[] = [];
  if (cli) {
    const out = run(['interpret', 'LINE.csv', '--poisson', String(poisson), '--json'], { 'LINE.csv': csv });
    if (out.code !== 0) { process.stdout.write(`${seed}\tfailed\t${out.stderr}\n`); continue; }
    const doc = JSON.parse(out.stdout);
    velocities = doc.layers.map((l: { velocity_mps: number }) => l.velocity_mps);
    classes = doc.site?.classes?.length ? doc.site.classes.map((c: { standard: string; class: string; class_by_estimate?: string }) => ({ standard: c.standard, class: c.class, byEstimate: c.class_by_estimate ?? c.class })) : undefined;
    codes = (doc.site?.cautions ?? []).map((c: { code: string }) => c.code);
  } else {
    const log = new WarningLog();
    const result = interpret(readFirstBreaks(csv, `line-${seed}.csv`, log), { vsFromVp: { poisson: [poisson] } }, log);
    velocities = result.layers.map((l) => l.velocity);
    classes = result.site?.classes.map((c) => ({ standard: c.standard, class: c.class, byEstimate: c.classByEstimate ?? c.class }));
    codes = (result.site?.cautions ?? []).map((c) => c.code);
  }
  const water = velocities.some((v) => v >= 1400 && v <= 2000);
  if (!water) lost++;
  const caution = codes.includes('vs-hidden-saturated-layer');
  if (caution) hiddenCaution++;
  if (!water && caution) lostWithCaution++;
  let tag = 'no class';
  if (classes === undefined) {
    if (water) { refused++; tag = 'refused (saturated layer found)'; } else none++;
  } else {
    classed++;
    const byEstimate = classes.some((c) => ROCK[c.standard]?.includes(c.byEstimate));
    const reported = classes.some((c) => ROCK[c.standard]?.includes(c.class));
    if (byEstimate) rockByEstimate++;
    if (reported) rockReported++;
    tag = classes.map((c) => `${c.standard} ${c.class}${c.byEstimate !== c.class ? ` (${c.byEstimate})` : ''}`).join(', ');
  }
  if (verbose) process.stdout.write(`${seed}\t${line.name}\tgot ${velocities.map(Math.round).join('/')}\t${tag}${caution ? '\t[hidden-saturated caution]' : ''}\n`);
}
process.stdout.write([
  `${kind} lines ${lines} (seeds ${first}-${first + lines - 1}, Poisson's ratio ${poisson}, ${cli ? 'command line' : 'interpret'})`,
  `saturated layer lost by the fit ${lost}`,
  `classed ${classed}, refused ${refused}, no site result ${none}`,
  `rock class by estimate ${rockByEstimate} of ${classed}`,
  `rock class reported ${rockReported} of ${classed}`,
  `hidden-saturated caution ${hiddenCaution} (on lost-water lines ${lostWithCaution} of ${lost})`,
].join('\n') + '\n');
