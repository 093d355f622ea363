/**
 * Median wall time of a function, in milliseconds, over `repeats` runs after five warm-up runs
 * (so that the compiler has settled); `describe` adds to the printed line.
 */
export function medianTime(label: string, run: () => unknown, repeats: number, describe: (ms: number) => string = () => `over ${repeats} runs`): number {
  for (let i = 0; i < 5; i++) run();
  const samples: number[] = [];
  for (let i = 0; i < repeats; i++) {
    const start = performance.now();
    run();
    samples.push(performance.now() - start);
  }
  samples.sort((a, b) => a - b);
  const median = samples[samples.length >> 1];
  process.stdout.write(`${label}: median ${median.toFixed(3)} ms, ${describe(median)}\n`);
  return median;
}
