// Runs StrykerJS over each module of stryker.config.mjs in turn (or only the one named by
// MUTATION_MODULE), each in its own process, and prints the score of each. `npm run mutation`.
//
// StrykerJS 10's command line refuses Node.js below 22 (a version guard in its CLI module), while
// this project runs on Node.js 20; its API, loaded from the file itself (its package exports only
// the CLI's index), runs here unchanged (measured on Node.js 20.20; see DEVELOPERS.md).
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { modules } from './stryker.config.mjs';

const only = process.env.MUTATION_MODULE;
if (process.env.MUTATION_CHILD === '1') {
  const { Stryker } = await import('./node_modules/@stryker-mutator/core/dist/src/stryker.js');
  const results = await new Stryker({ configFile: 'stryker.config.mjs' }).runMutationTest();
  const count = (...statuses) => results.filter((r) => statuses.includes(r.status)).length;
  const killed = count('Killed', 'Timeout');
  const survived = count('Survived', 'NoCoverage');
  console.log(`mutation score ${only}: ${((100 * killed) / Math.max(1, killed + survived)).toFixed(1)} % (${killed} killed or timed out, ${survived} survived or not covered, ${count('Ignored')} ignored, ${count('CompileError', 'RuntimeError')} errors)`);
} else {
  for (const name of only ? [only] : Object.keys(modules)) {
    const run = spawnSync(process.execPath, [fileURLToPath(import.meta.url)], { stdio: 'inherit', env: { ...process.env, MUTATION_MODULE: name, MUTATION_CHILD: '1' } });
    if (run.status !== 0) process.exit(run.status ?? 1);
  }
}
