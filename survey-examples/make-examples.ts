/**
 * Writes the invented survey examples from their true models with the independent forward model
 * of the tests (test/reference/layeredTravelTimes.ts: least time by Fermat's principle over
 * sampled interfaces) plus seeded Gaussian pick noise. Run: npx tsx survey-examples/make-examples.ts
 */
import { writeFileSync } from 'node:fs';
import { syntheticCsv, type LayeredSection } from '../test/reference/layeredTravelTimes.js';

interface Example {
  folder: string;
  header: string[];
  section: LayeredSection;
  sources: number[];
  receivers: number[];
  noiseMs: number;
  seed: number;
  wave?: 'S';
  file?: string;
}

const examples: Example[] = [
  {
    folder: 'pump-station',
    header: [
      'Invented example: line PS-1 at the Marlow Fen pump-station footing (site, client and line are fictional).',
      'True model: 450 m/s silty sand over 2600 m/s weathered sandstone; rock 4.5 m below ground at x = 0 m, 6.5 m at x = 94 m.',
      'Picks: independent forward model (Fermat least time) plus seeded Gaussian noise, sigma 0.25 ms, seed 11.',
    ],
    section: {
      surface: (x) => 212.0 - 0.015 * x,
      interfaces: [(x) => 212.0 - 0.015 * x - (4.5 + (2.0 * x) / 94)],
      velocities: [450, 2600],
    },
    sources: [-6, 0, 23, 47, 71, 94, 100],
    receivers: Array.from({ length: 48 }, (_, i) => i * 2),
    noiseMs: 0.25,
    seed: 11,
  },
  {
    folder: 'alluvial-terrace',
    header: [
      'Invented example: line T-2 on the upper terrace of the fictional Orrin valley, for a proposed two-storey school block.',
      'True model: 380 m/s dry sandy gravel, 1550 m/s saturated gravel below the water table at 3.2 m, 3200 m/s mudstone at 11.0 m (flat).',
      'Picks: independent forward model (Fermat least time) plus seeded Gaussian noise, sigma 0.25 ms, seed 23.',
    ],
    section: {
      surface: () => 54.0,
      interfaces: [() => 54.0 - 3.2, () => 54.0 - 11.0],
      velocities: [380, 1550, 3200],
    },
    sources: [-10, 0, 30, 58.75, 88.75, 117.5, 127.5],
    receivers: Array.from({ length: 48 }, (_, i) => i * 2.5),
    noiseMs: 0.25,
    seed: 23,
  },
  {
    folder: 'alluvial-terrace',
    file: 'sh-first-breaks.csv',
    header: [
      'Invented example: SH line T-2S along line T-2 on the fictional Orrin valley terrace (beam source, horizontal geophones).',
      'True model: shear-wave velocities 160 m/s loose sandy gravel to 2.0 m, 300 m/s dense gravel to 11.0 m, 1050 m/s mudstone below (flat).',
      'The water table at 3.2 m does not show: shear waves are not sped up by pore water.',
      'Picks: independent forward model (Fermat least time) plus seeded Gaussian noise, sigma 0.4 ms, seed 31.',
    ],
    section: {
      surface: () => 54.0,
      interfaces: [() => 52.0, () => 43.0],
      velocities: [160, 300, 1050],
    },
    sources: [-4.5, 0, 36, 70.5, 75],
    receivers: Array.from({ length: 48 }, (_, i) => i * 1.5),
    noiseMs: 0.4,
    seed: 31,
    wave: 'S',
  },
];

for (const example of examples) {
  const csv = syntheticCsv(example.section, example.sources, example.receivers, example.noiseMs, example.seed);
  const withWave = example.wave === undefined ? csv : csv.replace(/^(.*)$/gm, (line, _m, offset) => (line === '' ? line : `${line},${offset === 0 ? 'wave' : example.wave}`));
  const text = example.header.map((line) => `# ${line}`).join('\n') + '\n' + withWave;
  const path = new URL(`./${example.folder}/${example.file ?? 'first-breaks.csv'}`, import.meta.url);
  writeFileSync(path, text);
  process.stdout.write(`wrote ${path.pathname}\n`);
}
