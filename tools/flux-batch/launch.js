#!/usr/bin/env node
// Launcher for `npm run flux:batch`: runs the compiled CLI, compiling it first (TypeScript API,
// only the CLI and the flux engine, same output layout as `npm run build:server`) when the
// compiled file is missing or older than its sources. Plain JS so it needs no build itself.
'use strict';
const fs = require('fs');
const path = require('path');

const root = path.resolve(__dirname, '..', '..');
const outDir = path.join(root, 'dist', 'server');

function newestSource(dirs) {
  let newest = 0;
  for (const dir of dirs) {
    for (const f of fs.readdirSync(dir)) {
      if (f.endsWith('.ts') && !f.endsWith('.spec.ts')) newest = Math.max(newest, fs.statSync(path.join(dir, f)).mtimeMs);
    }
  }
  return newest;
}

function isStale(entryJs, sourceDirs) {
  if (!fs.existsSync(entryJs)) return true;
  return fs.statSync(entryJs).mtimeMs < newestSource(sourceDirs);
}

function compile(entryTs) {
  const ts = require('typescript');
  const configPath = path.join(root, 'server', 'tsconfig.json');
  const parsed = ts.getParsedCommandLineOfConfigFile(configPath, {}, { ...ts.sys, onUnRecoverableConfigFileDiagnostic: () => {} });
  const options = { ...parsed.options, incremental: false, tsBuildInfoFile: undefined, outDir, rootDir: root };
  const program = ts.createProgram([entryTs], options);
  const result = program.emit();
  const errors = ts.getPreEmitDiagnostics(program).concat(result.diagnostics).filter((d) => d.category === ts.DiagnosticCategory.Error);
  if (errors.length) {
    const host = { getCanonicalFileName: (f) => f, getCurrentDirectory: () => root, getNewLine: () => '\n' };
    process.stderr.write(ts.formatDiagnostics(errors, host));
    process.exit(1);
  }
}

/** Compiles `tools/<relTs>` if needed and returns the path of its compiled JS. */
function ensureBuilt(relTs) {
  const entryTs = path.join(root, relTs);
  const entryJs = path.join(outDir, relTs.replace(/\.ts$/, '.js'));
  const sourceDirs = [path.join(root, 'shared', 'flux'), path.dirname(entryTs)];
  if (isStale(entryJs, sourceDirs)) compile(entryTs);
  return entryJs;
}

module.exports = { ensureBuilt };

if (require.main === module) {
  const entry = ensureBuilt('tools/flux-batch/flux-batch.ts');
  require(entry).main(process.argv).catch((err) => {
    process.stderr.write(`flux-batch: ${String(err && err.message).replace(/\s+/g, ' ')}\n`);
    process.exit(2);
  });
}
