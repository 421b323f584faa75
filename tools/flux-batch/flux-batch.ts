/**
 * Batch flux CLI: `npm run --silent flux:batch < runs.json > results.json`.
 *   default  : stdin is {"runs":[…]}, stdout is {"results":[…]} in input order;
 *   --ndjson : one run per line in, one result per line out, streaming (bounded memory).
 * Malformed JSON: exit 2 with a one-line message on stderr (in --ndjson mode the results of the
 * lines before it have already been written). A run that cannot be fitted is a result with
 * `invalid-input` and an error, never a crash.
 */
import { processRun } from './batch-wire';

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

async function runBatch(): Promise<void> {
  const text = await readAll();
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (err) {
    fail(`malformed JSON: ${(err as Error).message}`);
  }
  const runs = doc && typeof doc === 'object' ? (doc as { runs?: unknown }).runs : undefined;
  if (!Array.isArray(runs)) fail('expected a JSON object {"runs": [...]}');
  const parts: string[] = [];
  for (let i = 0; i < runs.length; i++) parts.push(JSON.stringify(processRun(runs[i])));
  process.stdout.write(`{"results":[${parts.join(',')}]}\n`);
}

function runNdjson(): Promise<void> {
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
      out.push(JSON.stringify(processRun(run)) + '\n');
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
  const unknown = args.filter((a) => a !== '--ndjson');
  if (unknown.length) fail(`unknown argument ${unknown[0]} (usage: flux-batch [--ndjson] < input)`);
  await (args.includes('--ndjson') ? runNdjson() : runBatch());
}

if (require.main === module) {
  main(process.argv).catch((err: Error) => fail(err.message));
}
