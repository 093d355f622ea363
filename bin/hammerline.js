#!/usr/bin/env node
// Starts the command line from the compiled sources (npm install builds them into dist/).
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

const entry = new URL('../dist/src/cli/main.js', import.meta.url);
if (!existsSync(fileURLToPath(entry))) {
  process.stderr.write('hammerline: the program is not built; run "npm install" (or "npm run build") in the project folder first\n');
  process.exit(1);
}
const { main } = await import(entry.href);
process.exitCode = main(process.argv.slice(2));
