/** Where the demo finds the repository, its data and its scenario. */
import { readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { DemoTruth, Scenario } from '../../data/demo/generate.js';

/** The repository root (the demo runs every command from here, so paths in its records are relative). */
export const REPO = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');

/** The demo data folder, relative to the repository. */
export const DATA = 'data/demo';

/** The invented scenario (data/demo/scenario.json). */
export function scenario(): Scenario {
  return JSON.parse(readFileSync(join(REPO, DATA, 'scenario.json'), 'utf8')) as Scenario;
}

/** The truth the demo data were made from (data/demo/truth.json). */
export function truth(): DemoTruth {
  return JSON.parse(readFileSync(join(REPO, DATA, 'truth.json'), 'utf8')) as DemoTruth;
}
