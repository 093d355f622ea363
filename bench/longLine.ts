/**
 * Benchmark: long lines. A rolling spread of 96 live channels along lines of 250 to 2000 stations
 * (2 m apart), one shot every 5 stations, each recorded on the 96 channels centred on it, over
 * a two-layer section (400 m/s over 2200 m/s, the refractor 6 m deep with a gentle undulation;
 * head-wave times in closed form, Telford et al. 1990 §4.2, with seeded 0.25 ms noise).
 *
 * Targets (issue 10): the 1000-station line of 200 shots × 96 channels (19 200 picks) under 2 s
 * on one core; time per pick roughly constant with line length (printed as ratios against the
 * 250-station line measured in the same run); 200 000 picks finish with bounded memory (under
 * 1 GB: run it with `node --max-old-space-size=1024` to make the bound a hard limit).
 *
 * Run: npx tsx bench/longLine.ts [--big]
 */
import { WarningLog } from '../src/core/warnings.js';
import { readFirstBreaks } from '../src/io/firstBreaksCsv.js';
import { interpret } from '../src/interpret.js';
import { seededNormal } from '../test/reference/layeredTravelTimes.js';

const V1 = 400;
const V2 = 2200;
const SPACING = 2;
const CHANNELS = 96;

/** Depth of the refractor at x: 6 m with a 1 m undulation 300 m long. */
const depth = (x: number) => 6 + Math.sin((2 * Math.PI * x) / 300);

/** First-break table of a rolling-spread line, as the CSV a user would give. */
function lineCsv(stations: number, shotEvery: number): { csv: string; picks: number; shots: number } {
  const noise = seededNormal(3);
  const rows = ['source_id,source_x,receiver_x,time_ms'];
  const critical = Math.asin(V1 / V2);
  let picks = 0;
  let shots = 0;
  // Shots spread evenly from station 2 to station stations - 5 (each side keeps 3 picks or more).
  const count = Math.round(stations / shotEvery);
  for (let k = 0; k < count; k++) {
    const s = 2 + Math.round((k * (stations - 7)) / (count - 1));
    const sourceX = s * SPACING + SPACING / 2;
    const first = Math.max(0, Math.min(stations - CHANNELS, s - CHANNELS / 2));
    shots++;
    for (let r = first; r < first + CHANNELS; r++) {
      const x = r * SPACING;
      const offset = Math.abs(x - sourceX);
      // Head wave over a locally flat refractor at the mean of the depths under source and receiver.
      const h = (depth(sourceX) + depth(x)) / 2;
      const head = offset / V2 + (2 * h * Math.cos(critical)) / V1;
      const time = Math.min(offset / V1, head) + 0.00025 * noise();
      rows.push(`S${shots},${sourceX},${x},${(Math.max(time, 0.0001) * 1e3).toFixed(4)}`);
      picks++;
    }
  }
  return { csv: rows.join('\n') + '\n', picks, shots };
}

/** CPU time of this process (user + system), in ms: on a shared machine, closer to "one core" than wall time. */
function cpuMs(): number {
  const { user, system } = process.cpuUsage();
  return (user + system) / 1e3;
}

function timeOnce(stations: number, shotEvery: number): { picks: number; shots: number; ms: number; wallMs: number; parseMs: number; heapMb: number } {
  const { csv, picks, shots } = lineCsv(stations, shotEvery);
  const start = cpuMs();
  const wall = performance.now();
  const table = readFirstBreaks(csv, `line-${stations}.csv`, new WarningLog());
  const parsed = cpuMs();
  interpret(table, {}, new WarningLog());
  const end = cpuMs();
  return { picks, shots, ms: end - start, wallMs: performance.now() - wall, parseMs: parsed - start, heapMb: process.memoryUsage().rss / 2 ** 20 };
}

const sizes = process.argv.includes('--big') ? [] : [250, 500, 1000, 2000];
const results: { stations: number; picks: number; shots: number; ms: number; wallMs: number; parseMs: number; heapMb: number }[] = [];
for (const stations of sizes) {
  timeOnce(stations, 5); // warm-up
  const runs = [timeOnce(stations, 5), timeOnce(stations, 5), timeOnce(stations, 5)].sort((a, b) => a.ms - b.ms);
  results.push({ stations, ...runs[1] });
}
if (results.length > 0) {
  const reference = results[0].ms / results[0].picks;
  process.stdout.write('CPU time of read + interpret (median of 3 runs after one warm-up), wall time beside it\n');
  process.stdout.write('stations  shots  picks  CPU (ms)  wall (ms)  read (ms)  per pick (µs)  per pick / 250-station line\n');
  for (const r of results) {
    const perPick = r.ms / r.picks;
    process.stdout.write(`${String(r.stations).padStart(8)}  ${String(r.shots).padStart(5)}  ${String(r.picks).padStart(6)}  ${r.ms.toFixed(0).padStart(8)}  ${r.wallMs.toFixed(0).padStart(9)}  ${r.parseMs.toFixed(0).padStart(9)}  ${(perPick * 1e3).toFixed(1).padStart(13)}  ${(perPick / reference).toFixed(2).padStart(27)}\n`);
  }
  const target = results.find((r) => r.stations === 1000)!;
  process.stdout.write(`target: 19 200 picks under 2 s of CPU: ${target.ms < 2000 ? 'met' : 'NOT met'} (${(target.ms / 1000).toFixed(2)} s; wall ${(target.wallMs / 1000).toFixed(2)} s)\n`);
}
if (process.argv.includes('--big')) {
  // 200 000 picks: 10 420 stations, a shot every 5 stations (2084 shots × 96 channels).
  const big = timeOnce(10_420, 5);
  process.stdout.write(`${big.picks} picks (${big.shots} shots): CPU ${(big.ms / 1000).toFixed(1)} s (wall ${(big.wallMs / 1000).toFixed(1)} s), ${(big.ms / big.picks * 1e3).toFixed(1)} µs per pick, resident memory ${big.heapMb.toFixed(0)} MB (target under 1024 MB)\n`);
}
