/**
 * Sweep: tomography of forward-model lines with a water table over undulating rock (the
 * independent model of test/reference, seeded noise), the contour at the mean of the saturated
 * soil and rock velocities against the true rock head, for each starting model. Prints one row
 * per line and the mean. Not part of npm test. Run: npx tsx bench/tomographySweep.ts
 */
import { WarningLog } from '../src/core/warnings.js';
import { readFirstBreaks } from '../src/io/firstBreaksCsv.js';
import { interpret } from '../src/interpret.js';
import { tomography } from '../src/tomography/tomography.js';
import { syntheticCsv } from '../test/reference/layeredTravelTimes.js';

interface Line { dry: number; water: number; rock: number; rockMean: number; amplitude: number; wavelength: number; vDry: number; vRock: number; spacing: number; noise: number }
const lines: Line[] = [
  { dry: 3, water: 0, rock: 0, rockMean: 10, amplitude: 2.5, wavelength: 60, vDry: 450, vRock: 3300, spacing: 2, noise: 0.25 },
  { dry: 2, water: 0, rock: 0, rockMean: 8, amplitude: 2, wavelength: 40, vDry: 350, vRock: 2800, spacing: 2, noise: 0.3 },
  { dry: 4, water: 0, rock: 0, rockMean: 14, amplitude: 3, wavelength: 80, vDry: 600, vRock: 4000, spacing: 2.5, noise: 0.25 },
  { dry: 1.5, water: 0, rock: 0, rockMean: 7, amplitude: 1.5, wavelength: 50, vDry: 300, vRock: 2500, spacing: 1.5, noise: 0.2 },
  { dry: 3, water: 0, rock: 0, rockMean: 12, amplitude: 3, wavelength: 100, vDry: 500, vRock: 3500, spacing: 2, noise: 0.5 },
  { dry: 2.5, water: 0, rock: 0, rockMean: 9, amplitude: 2, wavelength: 30, vDry: 400, vRock: 3000, spacing: 2, noise: 0.3 },
];
const rows: string[] = [];
const means: number[][] = [[], []];
lines.forEach((line, n) => {
  const receivers = Array.from({ length: 48 }, (_, i) => i * line.spacing);
  const length = 47 * line.spacing;
  const sources = [-length / 4, -line.spacing / 2, length / 4, length / 2, (3 * length) / 4, length + line.spacing / 2, length * 1.25];
  const rockDepth = (x: number) => line.rockMean + line.amplitude * Math.sin((2 * Math.PI * x) / line.wavelength);
  const csv = syntheticCsv({ surface: () => 100, interfaces: [() => 100 - line.dry, (x) => 100 - rockDepth(x)], velocities: [line.vDry, 1500, line.vRock] }, sources, receivers, line.noise, 100 + n);
  const table = readFirstBreaks(csv, `line${n}.csv`, new WarningLog());
  let layered;
  try {
    layered = interpret(table, {}, new WarningLog());
  } catch {
    layered = undefined;
  }
  const contour = (1500 + line.vRock) / 2;
  const started = performance.now();
  const t = tomography(table, { contours: [contour] }, new WarningLog(), layered);
  const seconds = (performance.now() - started) / 1000;
  const cells = t.results.map((r, k) => {
    const pts = r.contours[0].points.filter((p) => p.covered && p.depth !== undefined);
    const err = pts.reduce((s, p) => s + Math.abs(p.depth! - rockDepth(p.x)) / rockDepth(p.x), 0) / Math.max(1, pts.length);
    means[k].push(err);
    return `${r.start}: ${(err * 100).toFixed(1)} % over ${pts.length}, RMS ${(r.iterations[r.iterations.length - 1].rms * 1e3).toFixed(2)} ms`;
  });
  rows.push(`line ${n} (dry ${line.dry} m at ${line.vDry}, water, rock ${line.rockMean} ± ${line.amplitude} m at ${line.vRock}; ${line.noise} ms; layered ${layered?.layers.map((l) => Math.round(l.velocity)).join('/') ?? 'none'}): ${cells.join('; ')} [${seconds.toFixed(1)} s]`);
  process.stdout.write(rows[rows.length - 1] + '\n');
});
means.forEach((m, k) => { if (m.length) process.stdout.write(`mean contour error, start ${k === 0 ? 'gradient' : 'layered'}: ${(100 * m.reduce((a, b) => a + b, 0) / m.length).toFixed(1)} % over ${m.length} lines\n`); });
