import { existsSync, readFileSync, readdirSync } from 'node:fs';
import { dirname, join, normalize } from 'node:path';
import { describe, expect, it } from 'vitest';

// The field app bundles web/src/ and every src/ module it reaches into a page and a Web Worker,
// where Node's built-in modules do not exist. Common practice: a bundler leaves such imports
// unresolved or stubs them, so the app would fail only at run time; this check fails at test
// time instead. Modules the app does not reach (the command line, the PDF printer) may use Node.
const NODE_ONLY = /from\s+['"](node:[^'"]+|fs|path|os|url|crypto|child_process|util|stream|buffer)['"]|\bprocess\.|\bBuffer\./;

function reachable(entries: string[]): Set<string> {
  const seen = new Set<string>();
  const stack = [...entries];
  while (stack.length > 0) {
    const file = normalize(stack.pop()!);
    if (seen.has(file)) continue;
    seen.add(file);
    const text = readFileSync(file, 'utf8');
    for (const match of text.matchAll(/(?:import|export)\s[^'"]*?from\s+['"](\.[^'"]+)['"]|import\(\s*['"](\.[^'"]+)['"]\s*\)/g)) {
      const target = join(dirname(file), match[1] ?? match[2]).replace(/\.js$/, '.ts');
      if (target.endsWith('.ts') && existsSync(target)) stack.push(target);
    }
  }
  return seen;
}

describe('the modules the field app bundles', () => {
  it('every src/ and web/src/ module the app reaches imports no Node built-in (node:*, fs, path, ...) and uses no process or Buffer', () => {
    const entries = readdirSync('web/src', { recursive: true, encoding: 'utf8' }).filter((f) => f.endsWith('.ts')).map((f) => join('web/src', f));
    const files = reachable(entries);
    // The walk reaches the pipeline and the readers the worker runs (a walk that found nothing would pass vacuously).
    expect([...files]).toEqual(expect.arrayContaining(['src/interpret.ts', 'src/io/seg2/read.ts', 'src/picking/recordPicks.ts', 'src/io/projectFile.ts']));
    expect([...files].filter((f) => NODE_ONLY.test(readFileSync(f, 'utf8')))).toEqual([]);
  });
});
