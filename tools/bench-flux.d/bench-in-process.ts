/**
 * In-process throughput of fitClosure (linear + exponential + quadratic + QC) on synthetic
 * closures; also writes the same closures as a batch file for the whole-process comparison.
 * Usage: node bench-in-process.js <closures> [--write file.json] [--write-ndjson file.ndjson]
 */
import { writeFileSync } from 'fs';
import { fitClosure, type ClosureInput } from '../../shared/flux/index';
import { runToInput } from '../flux-batch/batch-wire';
import { benchRuns } from './bench-closures';

function main(): void {
  const args = process.argv.slice(2);
  const count = Number(args[0] ?? 10000);
  const runs = benchRuns(count);
  const writeAt = args.indexOf('--write');
  if (writeAt >= 0) writeFileSync(args[writeAt + 1], JSON.stringify({ runs }));
  const ndAt = args.indexOf('--write-ndjson');
  if (ndAt >= 0) writeFileSync(args[ndAt + 1], runs.map((r) => JSON.stringify(r)).join('\n') + '\n');
  const inputs: ClosureInput[] = runs.map(runToInput);

  let selectedExp = 0;
  let expNull = 0;
  for (const input of inputs) {
    const r = fitClosure(input); // warm-up pass, also counts outcomes
    if (r.selected?.model === 'exponential') selectedExp++;
    if (!r.exponential) expNull++;
  }
  const rates: number[] = [];
  for (let rep = 0; rep < 5; rep++) {
    const start = process.hrtime.bigint();
    for (const input of inputs) fitClosure(input);
    const seconds = Number(process.hrtime.bigint() - start) / 1e9;
    rates.push(count / seconds);
  }
  rates.sort((a, b) => a - b);
  const median = rates[2];
  process.stdout.write(
    JSON.stringify({
      closures: count,
      points: inputs[0].tS.length,
      closures_per_s_median: Math.round(median),
      closures_per_s_best: Math.round(rates[4]),
      us_per_closure_median: 1e6 / median,
      exponential_selected: selectedExp,
      exponential_null: expNull,
    }) + '\n',
  );
}

main();
