/**
 * Installs a project-local Jupyter kernelspec for the notebooks in notebooks/: the tslab
 * kernel from this checkout's node_modules, registered under .jupyter-local/ (git-ignored).
 * Nothing outside the checkout is touched; Jupyter finds the kernel only when
 * JUPYTER_PATH points at .jupyter-local.
 *
 * Run: npm run kernel            (after npm ci && npm run build)
 */
import { existsSync, mkdirSync, renameSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

/** Name of the kernelspec; the notebooks' metadata names it. */
export const KERNEL_NAME = 'lineshift-tslab';

/** What kernel.json holds. */
export interface KernelSpec {
  argv: string[];
  display_name: string;
  language: string;
}

/** The kernelspec for the checkout at `repoRoot`: tslab from its node_modules. */
export function kernelSpec(repoRoot: string): KernelSpec {
  return {
    argv: [join(repoRoot, 'node_modules', '.bin', 'tslab'), 'kernel', '--config-path', '{connection_file}'],
    display_name: 'TypeScript (lineshift)',
    language: 'typescript',
  };
}

/**
 * Writes `<jupyterDir>/kernels/lineshift-tslab/kernel.json` (temporary file, then
 * rename) and returns its path. `jupyterDir` is what JUPYTER_PATH must point at.
 */
export function installKernelSpec(repoRoot: string, jupyterDir: string): string {
  const dir = join(jupyterDir, 'kernels', KERNEL_NAME);
  mkdirSync(dir, { recursive: true });
  const file = join(dir, 'kernel.json');
  const temporary = `${file}.${process.pid}.tmp`;
  writeFileSync(temporary, JSON.stringify(kernelSpec(repoRoot), null, 2) + '\n');
  renameSync(temporary, file);
  return file;
}

/** Problems that stop the kernel from running the notebooks, as messages (empty when none). */
export function kernelProblems(repoRoot: string): string[] {
  const problems: string[] = [];
  if (!existsSync(join(repoRoot, 'node_modules', '.bin', 'tslab'))) problems.push('node_modules/.bin/tslab is missing: run npm ci');
  if (!existsSync(join(repoRoot, 'dist', 'index.js'))) problems.push('dist/index.js is missing: run npm run build (the notebooks load the built library)');
  if (!existsSync(join(repoRoot, 'node_modules', 'lineshift', 'package.json'))) problems.push('node_modules/lineshift is missing: run npm ci (it links the checkout so that notebooks can import "lineshift")');
  return problems;
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const repoRoot = resolve(dirname(fileURLToPath(import.meta.url)), '..');
  const jupyterDir = join(repoRoot, '.jupyter-local');
  const file = installKernelSpec(repoRoot, jupyterDir);
  const problems = kernelProblems(repoRoot);
  process.stdout.write(
    [
      `Installed the kernelspec "${KERNEL_NAME}" in ${file}`,
      ...problems.map((p) => `lineshift: warning: ${p}`),
      '',
      'Open the notebooks with the project-local kernel:',
      `  JUPYTER_PATH=${jupyterDir} jupyter lab notebooks/`,
      'Run one headless (Debian: apt install jupyter-nbconvert jupyter-client python3-ipykernel):',
      `  JUPYTER_PATH=${jupyterDir} /usr/bin/jupyter nbconvert --to notebook --execute notebooks/your-own-files.ipynb --output-dir out/notebooks`,
      '',
    ].join('\n'),
  );
}
