/**
 * Runs one step of the demo through the command-line tool (`node dist/cli/main.js …`) and
 * records it: the command line, the exit code, the time, the files it read, and its JSON
 * output saved under the demo's steps/ folder. The record is the provenance the report shows.
 */
import { spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { writeFileAtomic } from '../../src/io/atomic-write.js';
import { REPO } from './paths.js';

/** One command the demo ran. */
export interface StepRecord {
  /** Short name, e.g. `calibrate-lamp`. */
  readonly name: string;
  /** What the step is for, one sentence. */
  readonly purpose: string;
  /** The arguments after `lineshift`, exactly as run (paths relative to the repository). */
  readonly args: readonly string[];
  readonly exitCode: number;
  readonly seconds: number;
  /** The step's JSON output, saved (relative to the repository), or null. */
  readonly output: string | null;
  /** Messages the tool wrote to standard error (warnings, failures). */
  readonly stderr: string;
}

/** What a step gives back. */
export interface StepResult<T> {
  readonly record: StepRecord;
  /** The parsed JSON of standard output (with --json). */
  readonly json: T;
}

/** Options of {@link runStep}. */
export interface StepOptions {
  /** Exit codes that count as success (default [0]). */
  readonly okExitCodes?: readonly number[];
  /** Let the tool's standard error through to this terminal (progress bar, failures) instead of capturing it. */
  readonly showStderr?: boolean;
  /** File (under the steps folder) to save the JSON output in. */
  readonly saveAs?: string;
}

/** The built command-line tool. */
export const CLI = join(REPO, 'dist', 'cli', 'main.js');

/** Thrown when a step fails unexpectedly. */
export class DemoStepError extends Error {}

/**
 * Runs `lineshift ARGS --json` in the repository folder and parses its output.
 *
 * @param name step name; @param purpose what it is for; @param args arguments after `lineshift` (without --json).
 * @param stepsDir folder (relative to the repository) where the JSON output is saved.
 * @throws {DemoStepError} when the exit code is not one of `okExitCodes` or the output is not JSON.
 */
export async function runStep<T>(name: string, purpose: string, args: readonly string[], stepsDir: string, options: StepOptions = {}): Promise<StepResult<T>> {
  if (!existsSync(CLI)) throw new DemoStepError(`${CLI} is missing: run npm run build first (npm run demo does)`);
  const full = [...args, '--json'];
  const t0 = performance.now();
  const child = spawn(process.execPath, [CLI, ...full], { cwd: REPO, stdio: ['ignore', 'pipe', options.showStderr ? 'inherit' : 'pipe'] });
  let stdout = '';
  let stderr = '';
  child.stdout!.setEncoding('utf8').on('data', (d: string) => { stdout += d; });
  child.stderr?.setEncoding('utf8').on('data', (d: string) => { stderr += d; });
  const exitCode = await new Promise<number>((resolve, reject) => {
    child.on('error', reject);
    child.on('close', (code, signal) => resolve(code ?? (signal ? 128 : 1)));
  });
  const seconds = (performance.now() - t0) / 1000;
  const ok = options.okExitCodes ?? [0];
  if (!ok.includes(exitCode)) {
    throw new DemoStepError(`step ${name} (lineshift ${full.join(' ')}) exited with ${exitCode}:\n${stderr.trim()}`);
  }
  let json: T;
  try {
    json = JSON.parse(stdout) as T;
  } catch {
    throw new DemoStepError(`step ${name} (lineshift ${full.join(' ')}) did not print JSON:\n${stdout.slice(0, 500)}`);
  }
  let output: string | null = null;
  if (options.saveAs) {
    output = join(stepsDir, options.saveAs);
    writeFileAtomic(join(REPO, output), JSON.stringify(json, null, 1) + '\n');
  }
  return { record: { name, purpose, args: full, exitCode, seconds, output, stderr }, json };
}

/** SHA-256 of a file (hex), for the report's list of inputs. */
export function sha256(path: string): string {
  return createHash('sha256').update(readFileSync(path)).digest('hex');
}
