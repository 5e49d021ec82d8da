import { existsSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe } from 'vitest';

/** The repository root. */
export const REPO_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');

/**
 * The shared reference folder beside the checkout (`../shared/reference`), or the folder
 * named by LINESHIFT_SHARED_REFERENCE.
 */
export const SHARED_REFERENCE = process.env.LINESHIFT_SHARED_REFERENCE ?? resolve(REPO_ROOT, '..', 'shared', 'reference');

/** True when the shared reference data is present. */
export const sharedAvailable = existsSync(join(SHARED_REFERENCE, 'README.md'));

/** Path of a file under the shared reference folder. */
export function sharedPath(...parts: string[]): string {
  return join(SHARED_REFERENCE, ...parts);
}

/**
 * A describe block that needs ../shared/reference. Where it is absent the block is
 * skipped, its title says why, and a warning is printed, so it never passes silently.
 */
export function describeWithShared(title: string, body: () => void): void {
  if (!sharedAvailable) {
    console.warn(`SKIPPED "${title}": shared reference data not found at ${SHARED_REFERENCE} (set LINESHIFT_SHARED_REFERENCE)`);
    describe.skip(`${title} [SKIPPED: ../shared/reference not found]`, body);
  } else {
    describe(title, body);
  }
}

/** Path of a file in the repository. */
export function repoPath(...parts: string[]): string {
  return join(REPO_ROOT, ...parts);
}
