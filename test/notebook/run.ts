/**
 * Runs the notebooks in notebooks/ headless with Debian's Jupyter (jupyter-nbconvert,
 * jupyter-client, python3-ipykernel) and the project's tslab kernelspec, installed into a
 * temporary JUPYTER_PATH folder; exports them to HTML for the browser check.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, renameSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';
import { describe } from 'vitest';
import { installKernelSpec } from '../../scripts/install-kernel.js';
import { REPO_ROOT, repoPath } from '../helpers/paths.js';

/** Debian's jupyter first (its python has nbconvert), then whatever is on PATH. */
const JUPYTER = ['/usr/bin/jupyter', 'jupyter'].find((j) => spawnSync(j, ['nbconvert', '--version'], { stdio: 'ignore' }).status === 0);

/** Why the notebooks cannot run here, or undefined when they can. */
export const jupyterMissing: string | undefined = JUPYTER
  ? undefined
  : 'jupyter nbconvert was not found (Debian: apt install jupyter-nbconvert jupyter-client python3-ipykernel)';

/** A describe block that needs Jupyter; skipped with a printed reason when it is absent. */
export function describeWithJupyter(title: string, body: () => void): void {
  if (jupyterMissing) {
    console.warn(`SKIPPED "${title}": ${jupyterMissing}`);
    describe.skip(`${title} [SKIPPED: ${jupyterMissing}]`, body);
  } else {
    describe(title, body);
  }
}

/** The notebooks in notebooks/, by file name. */
export function notebookNames(): string[] {
  return readdirSync(repoPath('notebooks')).filter((f) => f.endsWith('.ipynb')).sort();
}

/** Newest modification time of the files under a folder (ms). */
function newest(dir: string): number {
  let t = 0;
  for (const name of readdirSync(dir)) {
    const p = join(dir, name);
    const s = statSync(p);
    t = Math.max(t, s.isDirectory() ? newest(p) : s.mtimeMs);
  }
  return t;
}

/** Why dist/ cannot be used by the notebooks (missing or older than src/), or undefined. */
export function distProblem(): string | undefined {
  const index = repoPath('dist', 'index.js');
  if (!existsSync(index)) return 'dist/index.js is missing: run npm run build first (npm test does)';
  if (statSync(index).mtimeMs + 1 < newest(repoPath('src'))) return 'dist/ is older than src/: run npm run build first (npm test does)';
  return undefined;
}

/** One code cell of an executed notebook. */
export interface ExecutedCell {
  id: string;
  cell_type: string;
  metadata: { tags?: string[] };
  source: string[] | string;
  outputs?: { output_type: string; name?: string; text?: string[] | string; data?: Record<string, unknown>; ename?: string; evalue?: string }[];
  execution_count?: number | null;
}

/** An executed notebook and where its files are. */
export interface ExecutedNotebook {
  cells: ExecutedCell[];
  metadata: { kernelspec?: { name?: string } };
  /** Executed .ipynb (temporary folder). */
  ipynb: string;
  /** HTML export (temporary folder), copied to out/notebooks/ as well. */
  html: string;
  /** Seconds the execution took. */
  seconds: number;
}

/**
 * Executes `notebooks/<name>` with nbconvert in a fresh temporary folder and exports the
 * result to HTML with notebooks/.nbconvert/offline.html.j2. Copies both to out/notebooks/
 * (renamed into place) for a person and for the browser check. Throws with nbconvert's
 * output when the execution fails (a cell raising an error stops nbconvert).
 */
export function executeNotebook(name: string): ExecutedNotebook {
  if (!JUPYTER) throw new Error(jupyterMissing);
  const work = mkdtempSync(join(tmpdir(), 'lineshift-notebook-'));
  const jupyterPath = join(work, 'jupyter');
  installKernelSpec(REPO_ROOT, jupyterPath);
  const env = { ...process.env, JUPYTER_PATH: jupyterPath, JUPYTER_CONFIG_DIR: join(work, 'config'), JUPYTER_RUNTIME_DIR: join(work, 'runtime'), PYTHONWARNINGS: 'ignore' };
  const stem = basename(name, '.ipynb');
  const started = Date.now();
  const run = spawnSync(JUPYTER, ['nbconvert', '--to', 'notebook', '--execute', '--ExecutePreprocessor.timeout=120',
    '--output-dir', work, '--output', `${stem}.ipynb`, repoPath('notebooks', name)], { env, encoding: 'utf8', timeout: 180_000 });
  const seconds = (Date.now() - started) / 1000;
  const ipynb = join(work, `${stem}.ipynb`);
  if (run.status !== 0 || !existsSync(ipynb)) {
    throw new Error(`nbconvert --execute failed for notebooks/${name} (exit ${run.status}):\n${run.stderr.slice(-4000)}`);
  }
  execFileSync(JUPYTER, ['nbconvert', '--to', 'html', '--template-file', repoPath('notebooks', '.nbconvert', 'offline.html.j2'),
    '--output-dir', work, '--output', `${stem}.html`, ipynb], { env, stdio: 'pipe', timeout: 120_000 });
  const html = join(work, `${stem}.html`);
  const out = repoPath('out', 'notebooks');
  mkdirSync(out, { recursive: true });
  for (const file of [ipynb, html]) {
    const target = join(out, basename(file));
    copyFileSync(file, `${target}.${process.pid}.tmp`);
    renameSync(`${target}.${process.pid}.tmp`, target);
  }
  const nb = JSON.parse(readFileSync(ipynb, 'utf8')) as Omit<ExecutedNotebook, 'ipynb' | 'html' | 'seconds'>;
  return { ...nb, ipynb, html, seconds };
}

/** Text of a cell's source or of a stream output. */
export function joined(text: string[] | string | undefined): string {
  return Array.isArray(text) ? text.join('') : (text ?? '');
}
