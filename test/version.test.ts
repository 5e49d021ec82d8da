import { readFileSync } from 'node:fs';
import { expect, it } from 'vitest';
import { VERSION } from '../src/version.js';
import { repoPath } from './helpers/paths.js';

it('VERSION matches package.json', () => {
  expect(VERSION).toBe(JSON.parse(readFileSync(repoPath('package.json'), 'utf8')).version);
});
