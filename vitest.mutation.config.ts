import { defineConfig } from 'vitest/config';

// The tests StrykerJS runs against the mutants of each module (stryker.config.mjs sets
// MUTATION_MODULE): the module's own tests and the forward-model tests of the pipeline that reach
// it. On two shared cores the whole suite per surviving mutant would take hours, so the score is
// a lower bound of what the whole suite (npm test) kills.
const tests: Record<string, string[]> = {
  units: ['test/core/units.test.ts', 'test/io/depthsCsv.test.ts'],
  layers: ['test/fit/layerVelocities.test.ts', 'test/fit/dippingLayers.test.ts', 'test/fit/layers.test.ts', 'test/depth/interceptTime.test.ts', 'test/interpret.forward.test.ts'],
  site: ['test/site/**/*.test.ts'],
  depth: ['test/depth/**/*.test.ts', 'test/fit/dippingLayers.test.ts', 'test/interpret.forward.test.ts'],
  forward: ['test/forward/**/*.test.ts'],
  model: ['test/model/*.test.ts', 'test/interpret.forward.test.ts'],
};
const module = process.env.MUTATION_MODULE;
// MUTATION_TESTS replaces the module's test set (comma-separated globs), e.g. its fast unit tests
// alone: a survivor then costs seconds, not the minute of the pipeline tests, and the score is a
// lower bound of the module's own (see DEVELOPERS.md, "Mutation testing").
const only = process.env.MUTATION_TESTS?.split(',').map((t) => t.trim()).filter((t) => t !== '');

export default defineConfig({
  test: {
    include: only !== undefined && only.length > 0 ? only : module !== undefined && module in tests ? tests[module] : Object.values(tests).flat(),
    testTimeout: 60_000,
  },
});
