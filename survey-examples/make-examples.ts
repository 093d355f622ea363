/**
 * Writes the invented survey examples from their true models with the independent forward model
 * of the tests (test/reference/layeredTravelTimes.ts: least time by Fermat's principle over
 * sampled interfaces) plus seeded Gaussian pick noise. Run: npx tsx survey-examples/make-examples.ts
 */
import { writeFileSync } from 'node:fs';
import { mkdirSync } from 'node:fs';
import { writeSeg2 } from '../test/io/seg2/writeSeg2.js';
import { causalTrace } from '../test/picking/syntheticRecord.js';
import { firstArrivals, syntheticCsv, type LayeredSection } from '../test/reference/layeredTravelTimes.js';

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

// Shot records (SEG-2) of the pump-station line: one file per source, the first arrival a causal
// 60 Hz wavelet at the forward-model time, signal-to-noise falling with offset from about 44 to 5,
// 0.25 ms sampling with 5 ms of pre-trigger (DELAY -0.005 s), 32-bit integer samples. Channel 17 of
// the third shot is a dead trace (TRACE_TYPE DEAD, all zeros).
{
  const example = examples[0];
  const folder = new URL('./pump-station/records/', import.meta.url);
  mkdirSync(folder, { recursive: true });
  const dt = 0.00025;
  const delay = -0.005;
  const samples = 600;
  example.sources.forEach((sx, s) => {
    const times = firstArrivals(example.section, sx, example.receivers, [Math.min(...example.sources) - 5, Math.max(...example.sources) + 5]);
    const traces = example.receivers.map((rx, r) => {
      const offset = Math.abs(rx - sx);
      const snr = 40 * Math.exp(-offset / 40) + 4;
      const dead = s === 2 && r === 16;
      const data = dead ? new Float32Array(samples) : causalTrace(samples, dt, delay, times[r], snr, 1000 * (s + 1) + r);
      const keywords: [string, string][] = [
        ['CHANNEL_NUMBER', String(r + 1)],
        ['SAMPLE_INTERVAL', String(dt)],
        ['DELAY', String(delay)],
        ['DESCALING_FACTOR', '0.001'],
        ['SOURCE_LOCATION', `${sx} 0 ${example.section.surface(sx).toFixed(3)}`],
        ['RECEIVER_LOCATION', `${rx} 0 ${example.section.surface(rx).toFixed(3)}`],
        ['STACK', '8'],
        ...(dead ? [['TRACE_TYPE', 'DEAD'] as [string, string]] : []),
      ];
      return { code: 2 as const, keywords, samples: Array.from(data, (v) => Math.round(v * 1000)) };
    });
    const bytes = writeSeg2(traces, { fileKeywords: [['UNITS', 'METERS'], ['NOTE', 'Invented example: line PS-1, Marlow Fen pump station (fictional). Synthetic record.']] });
    writeFileSync(new URL(`S${s + 1}.seg2`, folder), bytes);
  });
  process.stdout.write(`wrote ${example.sources.length} records in ${folder.pathname}\n`);
}

// Line VC-3 at the invented Velmoor Brook culvert (see velmoor-culvert/README.md): a water table
// over undulating rock, sources off both ends, records that carry station numbers only (no
// positions), placed on the line by the station table. 36 channels at 2.5 m; 0.25 ms sampling
// with 5 ms of pre-trigger; first arrival a causal 60 Hz wavelet at the forward-model time,
// signal-to-noise falling with offset from about 34 to 4.
{
  const ground = (x: number) => 61.0 - 0.01 * x + 0.35 * Math.sin((2 * Math.PI * x) / 55);
  const waterTable = 58.3;
  const rockDepth = (x: number) => 9.5 + 2.0 * Math.sin((2 * Math.PI * (x - 15)) / 65);
  const section: LayeredSection = {
    surface: ground,
    interfaces: [() => waterTable, (x) => ground(x) - rockDepth(x)],
    velocities: [430, 1500, 3100],
  };
  const receivers = Array.from({ length: 36 }, (_, i) => i * 2.5);
  const sources = [-42.5, 0, 30, 45, 57.5, 87.5, 130];
  const station = (x: number) => 100 + Math.round(x / 2.5);
  const root = new URL('./velmoor-culvert/', import.meta.url);
  const folder = new URL('./velmoor-culvert/records/', import.meta.url);
  mkdirSync(folder, { recursive: true });
  const stationRows = ['station,x,elev'];
  for (let x = -42.5; x <= 130; x += 2.5) stationRows.push(`${station(x)},${x},${ground(x).toFixed(3)}`);
  writeFileSync(new URL('stations.csv', root), '# Invented example: line VC-3, Velmoor Brook culvert (fictional). Station numbers every 2.5 m; x along the line and ground elevation in metres.\n' + stationRows.join('\n') + '\n');
  const dt = 0.00025;
  const delay = -0.005;
  const samples = 480;
  sources.forEach((sx, s) => {
    const times = firstArrivals(section, sx, receivers, [Math.min(...sources) - 5, Math.max(...sources) + 5]);
    const traces = receivers.map((rx, r) => {
      const offset = Math.abs(rx - sx);
      const snr = 30 * Math.exp(-offset / 45) + 4;
      const data = causalTrace(samples, dt, delay, times[r], snr, 5000 + 100 * s + r);
      const keywords: [string, string][] = [
        ['CHANNEL_NUMBER', String(r + 1)],
        ['SAMPLE_INTERVAL', String(dt)],
        ['DELAY', String(delay)],
        ['DESCALING_FACTOR', '0.001'],
        ['SOURCE_STATION_NUMBER', String(station(sx))],
        ['RECEIVER_STATION_NUMBER', String(station(rx))],
        ['STACK', '6'],
      ];
      return { code: 2 as const, keywords, samples: Array.from(data, (v) => Math.round(v * 1000)) };
    });
    const bytes = writeSeg2(traces, { fileKeywords: [['UNITS', 'METERS'], ['NOTE', 'Invented example: line VC-3, Velmoor Brook culvert (fictional). Synthetic record.']] });
    writeFileSync(new URL(`VC3-${String(s + 1).padStart(2, '0')}.seg2`, folder), bytes);
  });
  process.stdout.write(`wrote ${sources.length} records and the station table in ${root.pathname}\n`);
}
