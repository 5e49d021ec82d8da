/**
 * What the tslab notebook kernel needs from the built library (see DESIGN notes, measured
 * with tslab 1.0.22 on Node 20.20): top-level "main" and "types" in package.json, .d.ts files
 * that TypeScript 5.0 with the old "node" resolution accepts, and an import graph without
 * top-level await, so that require() can load it.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { repoPath } from '../helpers/paths.js';
import { distProblem } from './run.js';

type TS = typeof import('typescript');

describe('the built library loads in the notebook kernel', () => {
  it('package.json has top-level main and types pointing into dist/', () => {
    const pkg = JSON.parse(readFileSync(repoPath('package.json'), 'utf8')) as { main?: string; types?: string; devDependencies?: Record<string, string> };
    expect(pkg.main).toBe('dist/index.js');
    expect(pkg.types).toBe('dist/index.d.ts');
    // The self link that lets a notebook import the library by its name.
    expect(pkg.devDependencies?.lineshift).toBe('file:.');
    expect(existsSync(repoPath('node_modules', 'lineshift', 'package.json'))).toBe(true);
  });

  it('require() loads dist/index.js (no top-level await in its import graph) and render works after it', () => {
    const problem = distProblem();
    if (problem) throw new Error(problem);
    const script = `
      const l = require('lineshift');
      if (typeof l.display !== 'function' || typeof l.spectrumPlot !== 'function') throw new Error('exports missing');
      l.renderSvg(l.spectrumPlot({ wavelengthAngstrom: [1, 2], flux: [1, 2] })).then((svg) => process.stdout.write(svg.slice(0, 4)));`;
    const run = spawnSync(process.execPath, ['-e', script], { cwd: repoPath('notebooks'), encoding: 'utf8', timeout: 60_000 });
    expect(run.stderr).toBe('');
    expect(run.stdout).toBe('<svg');
  });

  it("TypeScript 5.0 (tslab's compiler) type-checks a notebook cell that imports the library by name", () => {
    const problem = distProblem();
    if (problem) throw new Error(problem);
    const ts = createRequire(import.meta.url)('@tslab/typescript-for-tslab') as TS;
    expect(ts.version).toMatch(/^5\.0\./);
    const cellFile = repoPath('notebooks', '__cell__.ts');
    const cell = `
      import { createSpectrum, display, spectrumPlot, spectrumPlotData, reportHtml, type MimeBundle } from 'lineshift';
      const s = createSpectrum({ wavelength: [6560, 6561], flux: [1, 0.5], medium: 'air' });
      const spec = spectrumPlot(spectrumPlotData(s));
      spec.width = 500;
      const b: Promise<void> = display(spec);
      const html: string = reportHtml({ title: 't', sections: [] });
      export const used: [unknown, unknown, MimeBundle | undefined] = [b, html, undefined];
    `;
    // The options tslab passes to its compiler for a cell (dist/converter.js): old "node" resolution, ES2019 or later.
    const options: import('typescript').CompilerOptions = {
      target: ts.ScriptTarget.ES2019, module: ts.ModuleKind.CommonJS, moduleResolution: ts.ModuleResolutionKind.Node10,
      esModuleInterop: true, strict: true, noEmit: true, types: ['node'], lib: ['lib.es2022.d.ts'],
    };
    const host = ts.createCompilerHost(options);
    const readFile = host.readFile.bind(host);
    const fileExists = host.fileExists.bind(host);
    host.readFile = (f) => (f === cellFile ? cell : readFile(f));
    host.fileExists = (f) => f === cellFile || fileExists(f);
    const getSourceFile = host.getSourceFile.bind(host);
    host.getSourceFile = (f, v, ...rest) => (f === cellFile ? ts.createSourceFile(f, cell, v) : getSourceFile(f, v, ...rest));
    const program = ts.createProgram([cellFile], options, host);
    const diagnostics = ts.getPreEmitDiagnostics(program).map((d) => `${d.file?.fileName ?? ''}: ${ts.flattenDiagnosticMessageText(d.messageText, '\n')}`);
    expect(diagnostics).toEqual([]);
    // It did use the built declarations, through the package name.
    expect(program.getSourceFiles().some((f) => f.fileName.endsWith('dist/index.d.ts'))).toBe(true);
  });
});
