import path from 'node:path';
import * as ts from 'typescript';

const root = path.resolve(__dirname, '..');

/** Every project file the compiler reads for one tsconfig (its own files and all they import). */
function filesRead(config: string): string[] {
  const parsed = ts.getParsedCommandLineOfConfigFile(
    path.join(root, config),
    {},
    { ...ts.sys, onUnRecoverableConfigFileDiagnostic: () => undefined },
  )!;
  const program = ts.createProgram(parsed.fileNames, { ...parsed.options, noEmit: true, incremental: false });
  return program
    .getSourceFiles()
    .map((f) => path.relative(root, f.fileName))
    .filter((f) => !f.startsWith('node_modules'));
}

describe('production server build', () => {
  jest.setTimeout(120_000);

  it('when the server is compiled for production, then it contains no tools, local fakes, test helpers, browser code or specs', () => {
    const files = filesRead('server/tsconfig.json');
    expect(files).toContain('server/main.ts');
    expect(files.filter((f) => !/^(server|shared)\//.test(f) || /\.spec\.ts$/.test(f))).toEqual([]);
  });
});
