/**
 * Batch flux CLI: `npm run --silent flux:batch < runs.json > results.json`.
 *   default  : stdin is {"runs":[…]}, stdout is {"results":[…]} in input order;
 *   --ndjson : one run per line in, one result per line out, streaming (bounded memory);
 *   --full   : add the quadratic fit, all model parameters and the fit window to each result.
 * The batch document also carries the engine version: {"engine_version": …, "results": […]}.
 * Malformed JSON: exit 2 with a one-line message on stderr (in --ndjson mode the results of the
 * lines before it have already been written). A run that cannot be fitted is a result with
 * `invalid-input` and an error, never a crash.
 */
import { engineVersion } from '../../shared/flux/index';
import { processRun } from './batch-wire';
import { forEachRun, MalformedJson } from './runs-splitter';

const FLUSH_LINES = 512;

function fail(message: string): never {
  process.stderr.write(`flux-batch: ${message.replace(/\s+/g, ' ')}\n`);
  process.exit(2);
}

function readAll(): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    process.stdin.on('data', (c: Buffer) => chunks.push(c));
    process.stdin.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
    process.stdin.on('error', reject);
  });
}

async function runBatch(full: boolean): Promise<void> {
  const input = await readAll();
  // Results are kept as joined chunks and written only once the whole document proved valid,
  // so malformed input never leaves half an output behind.
  const chunks: string[] = [];
  let part: string[] = [];
  let sawRuns: boolean;
  try {
    sawRuns = forEachRun(input, (run) => {
      part.push(JSON.stringify(processRun(run, full)));
      if (part.length >= FLUSH_LINES) {
        chunks.push(part.join(','));
        part = [];
      }
    });
  } catch (err) {
    if (err instanceof MalformedJson) fail(`malformed JSON: ${err.message}`);
    throw err;
  }
  if (!sawRuns) fail('expected a JSON object {"runs": [...]}');
  if (part.length) chunks.push(part.join(','));
  process.stdout.write(`{"engine_version":${JSON.stringify(engineVersion)},"results":[`);
  for (let i = 0; i < chunks.length; i++) process.stdout.write(i === 0 ? chunks[i] : ',' + chunks[i]);
  process.stdout.write(']}\n');
}

function runNdjson(full: boolean): Promise<void> {
  return new Promise((resolve, reject) => {
    let pending = '';
    let lineNo = 0;
    let out: string[] = [];
    const handle = (line: string): void => {
      lineNo++;
      if (line.trim() === '') return;
      let run: unknown;
      try {
        run = JSON.parse(line);
      } catch (err) {
        process.stdout.write(out.join(''));
        fail(`malformed JSON on line ${lineNo}: ${(err as Error).message}`);
      }
      out.push(JSON.stringify(processRun(run, full)) + '\n');
      if (out.length >= FLUSH_LINES) {
        process.stdout.write(out.join(''));
        out = [];
      }
    };
    process.stdin.setEncoding('utf8');
    process.stdin.on('data', (chunk: string) => {
      const text = pending + chunk;
      let start = 0;
      let nl = text.indexOf('\n', start);
      while (nl !== -1) {
        handle(text.slice(start, nl));
        start = nl + 1;
        nl = text.indexOf('\n', start);
      }
      pending = text.slice(start);
    });
    process.stdin.on('end', () => {
      if (pending) handle(pending);
      process.stdout.write(out.join(''));
      resolve();
    });
    process.stdin.on('error', reject);
  });
}

export async function main(argv: string[]): Promise<void> {
  const args = argv.slice(2);
  const unknown = args.filter((a) => a !== '--ndjson' && a !== '--full');
  if (unknown.length) fail(`unknown argument ${unknown[0]} (usage: flux-batch [--ndjson] [--full] < input)`);
  const full = args.includes('--full');
  await (args.includes('--ndjson') ? runNdjson(full) : runBatch(full));
}

if (require.main === module) {
  main(process.argv).catch((err: Error) => fail(err.message));
}
