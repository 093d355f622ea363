import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

// The browser app bundles src/ (everything but src/cli/) into a page and a Web Worker, where
// Node's built-in modules do not exist. Common practice: a bundler leaves such imports unresolved,
// so the app would fail only at run time; this check fails at test time instead.
function files(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    return statSync(path).isDirectory() ? files(path) : path.endsWith('.ts') ? [path] : [];
  });
}

describe('src outside src/cli', () => {
  it('src/ outside src/cli imports no Node built-in module (node:*, fs, path, ...), and uses no process or Buffer', () => {
    const nodeModules = /from\s+['"](node:[^'"]+|fs|path|os|url|crypto|child_process|util|stream|buffer)['"]|\bprocess\.|\bBuffer\./;
    const offenders = files('src').filter((f) => !f.startsWith(join('src', 'cli'))).filter((f) => nodeModules.test(readFileSync(f, 'utf8')));
    expect(offenders).toEqual([]);
  });
});
