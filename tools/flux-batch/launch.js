#!/usr/bin/env node
// Launcher for `npm run flux:batch`: runs the compiled CLI, compiling it first (TypeScript API,
// same output layout as `npm run build:tools`) when the compiled file is missing or older than
// any file the compiler read for it. That list is written beside the output at each compile, so
// an import from any folder counts, not only the folders the entry sits in. Plain JS so it needs
// no build itself.
'use strict';
const fs = require('fs');
const path = require('path');

const root = path.resolve(__dirname, '..', '..');
const outDir = path.join(root, 'dist', 'tools');

const configPath = path.join(root, 'server', 'tsconfig.json');
const manifestOf = (entryJs) => `${entryJs}.sources.json`;

/** True when the output is missing, or a source or config the last compile read is newer or gone. */
function isStale(entryJs) {
  const manifest = manifestOf(entryJs);
  if (!fs.existsSync(entryJs) || !fs.existsSync(manifest)) return true;
  const builtAt = fs.statSync(entryJs).mtimeMs;
  const sources = JSON.parse(fs.readFileSync(manifest, 'utf8'));
  return sources.some((f) => !fs.existsSync(f) || fs.statSync(f).mtimeMs > builtAt);
}

function compile(entryTs, entryJs) {
  const ts = require('typescript');
  const parsed = ts.getParsedCommandLineOfConfigFile(configPath, {}, { ...ts.sys, onUnRecoverableConfigFileDiagnostic: () => {} });
  const options = { ...parsed.options, incremental: false, tsBuildInfoFile: undefined, outDir, rootDir: root };
  const program = ts.createProgram([entryTs], options);
  const result = program.emit();
  const errors = ts
    .getPreEmitDiagnostics(program)
    .concat(result.diagnostics)
    .filter((d) => d.category === ts.DiagnosticCategory.Error);
  if (errors.length) {
    const host = { getCanonicalFileName: (f) => f, getCurrentDirectory: () => root, getNewLine: () => '\n' };
    process.stderr.write(ts.formatDiagnostics(errors, host));
    process.exit(1);
  }
  const read = program
    .getSourceFiles()
    .map((f) => path.resolve(f.fileName))
    .filter((f) => !f.includes(`${path.sep}node_modules${path.sep}`));
  fs.writeFileSync(manifestOf(entryJs), JSON.stringify([configPath, ...read]));
}

/** Compiles `tools/<relTs>` if needed and returns the path of its compiled JS. */
function ensureBuilt(relTs) {
  const entryTs = path.join(root, relTs);
  const entryJs = path.join(outDir, relTs.replace(/\.ts$/, '.js'));
  if (isStale(entryJs)) compile(entryTs, entryJs);
  return entryJs;
}

module.exports = { ensureBuilt, isStale };

if (require.main === module) {
  const entry = ensureBuilt('tools/flux-batch/flux-batch.ts');
  require(entry)
    .main(process.argv)
    .catch((err) => {
      process.stderr.write(`flux-batch: ${String(err && err.message).replace(/\s+/g, ' ')}\n`);
      process.exit(2);
    });
}
