/** Prints the joint model's layer-count candidates for one sweep line: npx tsx test/reference/sweep/debugLine.ts SEED */
import { WarningLog } from '../../../src/core/warnings.js';
import { readFirstBreaks } from '../../../src/io/firstBreaksCsv.js';
import { interpret } from '../../../src/interpret.js';
import { realisticCsv, realisticLine } from '../realisticLines.js';

const seed = Number(process.argv[2] ?? 1);
const line = realisticLine(seed, JSON.parse(process.argv[3] ?? '{}'));
const log = new WarningLog();
const result = interpret(readFirstBreaks(realisticCsv(line, seed), `line-${seed}.csv`, log), {}, log);
process.stdout.write(`${line.name}\nsources ${line.sources.join(', ')}\n`);
process.stdout.write(`layers ${result.layers.map((l) => `${Math.round(l.velocity)}±${Math.round(l.velocitySe)}`).join(' / ')}\n`);
if (result.joint) {
  for (const c of result.joint.candidates) process.stdout.write(`  N=${c.refractors} bic=${c.value?.toFixed(1)} rss=${(c.rss * 1e6).toFixed(2)} p=${c.parameters} it=${c.iterations} ${c.rejected ?? ''}\n`);
  process.stdout.write(`  iterations ${result.joint.iterations} converged ${result.joint.converged} reassigned ${result.joint.reassigned} sigma ${(result.joint.model.sigma * 1e3).toFixed(3)} ms\n`);
  for (const p of result.joint.possible) process.stdout.write(`  possible ${JSON.stringify(p)}\n`);
}
process.stdout.write(`noise ${JSON.stringify(result.pickNoise)} forward ${result.forward ? (result.forward.rms * 1e3).toFixed(3) : '-'} ms\n`);
for (const f of result.fits) process.stdout.write(`  ${f.branch.sourceId}:${f.branch.side} ${f.segments.map((s) => `L${s.layer}[${s.firstOffset}-${s.lastOffset}] ${Math.round(s.apparentVelocity)}`).join('  ')}\n`);
for (const w of result.warnings) process.stdout.write(`  ! ${w.code}: ${w.message.slice(0, 160)}\n`);
