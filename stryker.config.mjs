// Mutation testing (StrykerJS, https://stryker-mutator.io) over the modules whose numbers reach a
// permit packet: depths, site classes, layer velocities and dips, units, the forward model, the
// joint time-term model and the layered inversion.
// `npm run mutation` runs every module in turn; `MUTATION_MODULE=site npm run mutation` one of them.
// Each module writes its own report folder under reports/mutation/ (git-ignored), with an
// incremental file so a rerun tests only the mutants whose code or tests changed.
// See DEVELOPERS.md, "Mutation testing".
import { createHash } from 'node:crypto';

export const modules = {
  depth: ['src/depth/**/*.ts'],
  site: ['src/site/**/*.ts'],
  layers: ['src/fit/layers.ts', 'src/fit/dippingLayers.ts'],
  units: ['src/core/units.ts'],
  forward: ['src/forward/**/*.ts'],
  model: ['src/model/**/*.ts'],
};

const selected = process.env.MUTATION_MODULE;
if (selected !== undefined && !(selected in modules)) {
  throw new Error(`MUTATION_MODULE=${selected} is not a module; expected one of ${Object.keys(modules).join(', ')}`);
}
// MUTATION_FILES narrows a run to some files of the module (comma-separated globs, Stryker's
// `file:line-line` ranges allowed), e.g. MUTATION_MODULE=site MUTATION_FILES=src/site/vs30.ts: a
// slow module can then be measured file by file. Such a run keeps its own report folder (named
// after the files) so the incremental file of the whole module is not overwritten.
const files = process.env.MUTATION_FILES?.split(',').map((f) => f.trim()).filter((f) => f !== '');
if (files !== undefined && files.length > 0 && selected === undefined) {
  throw new Error('MUTATION_FILES needs MUTATION_MODULE (the module whose tests run against the mutants)');
}
const narrowed = files !== undefined && files.length > 0;
// MUTATION_TESTS (read by vitest.mutation.config.ts) runs other tests against the mutants; such a
// run keeps its own folder too, its name ending in the tests' names.
const tests = process.env.MUTATION_TESTS?.trim() ? `@${process.env.MUTATION_TESTS.replace(/[^A-Za-z0-9.+-]+/g, '_')}` : '';
// A folder name longer than the file system allows (255 bytes) is cut and given a hash of the whole.
const short = (name) => (name.length <= 120 ? name : `${name.slice(0, 100)}~${createHash('sha1').update(name).digest('hex').slice(0, 12)}`);
const folder = narrowed
  ? `reports/mutation/${selected}/${short(`${files.join('+').replace(/[^A-Za-z0-9.+-]+/g, '_')}${tests}`)}`
  : `reports/mutation/${short(`${selected ?? 'all'}${tests}`)}`;

export default {
  testRunner: 'vitest',
  vitest: { configFile: 'vitest.mutation.config.ts' },
  mutate: narrowed ? files : selected ? modules[selected] : Object.values(modules).flat(),
  // Only the tests that cover a mutant run against it.
  coverageAnalysis: 'perTest',
  // Static mutants (module-level constants) would need the whole suite per mutant; they are left
  // out and the report says how many.
  ignoreStatic: true,
  // Two cores shared with other work: one test process at a time (run it under `nice`).
  concurrency: 1,
  incremental: true,
  incrementalFile: `${folder}/incremental.json`,
  reporters: ['clear-text', 'progress', 'html', 'json'],
  htmlReporter: { fileName: `${folder}/index.html` },
  jsonReporter: { fileName: `${folder}/mutation.json` },
  clearTextReporter: { allowColor: false, logTests: false, reportMutants: false, reportScoreTable: true },
  thresholds: { high: 90, low: 80 },
  tempDirName: '.stryker-tmp',
  cleanTempDir: 'always',
  timeoutMS: 30000,
};
