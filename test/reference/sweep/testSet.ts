/** Prints each line of the realistic-lines test with its outcome: npx tsx test/reference/sweep/testSet.ts */
import { realisticCsv, realisticLine, type LineChoices } from '../realisticLines.js';
import { interpretCsv } from '../../helpers.js';

const base: LineChoices = { geophones: 48, spacing: 2, inside: 5, offEnd: true, noiseMs: 0.25, step: 0.2 };
const kinds: LineChoices[] = [
  { layers: 'water-table', shape: 'flat', ground: 'flat', deepest: 10 },
  { layers: 'water-table', shape: 'undulating', ground: 'flat', deepest: 10 },
  { layers: 'two', shape: 'undulating', ground: 'rolling', deepest: 9 },
  { layers: 'two', shape: 'channel', ground: 'flat', deepest: 8 },
  { layers: 'water-table', shape: 'channel', ground: 'flat', deepest: 11 },
  { layers: 'weathered', shape: 'flat', ground: 'sloping', deepest: 12 },
];
kinds.forEach((kind, kindIndex) => {
  for (let s = 1; s <= 5; s++) {
    const seed = 100 * kindIndex + s;
    const line = realisticLine(seed, { ...base, ...kind });
    const { result } = interpretCsv(realisticCsv(line, seed));
    const got = result.layers.map((l) => l.velocity);
    const v = line.section.velocities.map((t, i) => (got[i] ? `${((got[i] / t - 1) * 100).toFixed(1)}%` : '-'));
    const d = line.depth.map((depthAt, k) => {
      const points = result.refractors[k]?.points ?? [];
      if (points.length === 0) return 'none';
      const error = points.reduce((a, p) => a + Math.abs(p.depth - depthAt(p.x)), 0) / points.length;
      const mean = points.reduce((a, p) => a + depthAt(p.x), 0) / points.length;
      return `${error.toFixed(2)}m/${Math.max(0.25, 0.05 * mean).toFixed(2)}`;
    });
    process.stdout.write(`${seed}\t${got.length === line.section.velocities.length ? 'count ok' : `COUNT ${got.length}`}\tv ${v.join(' ')}\td ${d.join(' ')}\t${line.name}\n`);
  }
});
