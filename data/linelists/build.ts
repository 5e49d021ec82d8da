/**
 * Builds data/linelists/ from the reference line lists beside the checkout
 * (../shared/reference/linelists, or $LINESHIFT_SHARED_REFERENCE/linelists).
 *
 * Every CSV there is copied byte for byte (air wavelengths in Å, NIST Handbook relative
 * intensity, source_id, note), after checking that it has the expected columns and that
 * every row reads; CHECKS.md (the comparison between sources that the tests cite) is
 * copied too. SOURCES.md in this folder is written by hand from the shared SOURCES.md.
 *
 * Usage:  npx tsx data/linelists/build.ts           (write the files)
 *         npx tsx data/linelists/build.ts --check   (exit 1 if the files here differ)
 */
import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseLineListCsv } from '../../src/lines/linelist.js';

const here = dirname(fileURLToPath(import.meta.url));
const repoRoot = resolve(here, '..', '..');
const sharedReference = process.env.LINESHIFT_SHARED_REFERENCE ?? resolve(repoRoot, '..', 'shared', 'reference');
const sourceDir = join(sharedReference, 'linelists');
const check = process.argv.includes('--check');

if (!existsSync(sourceDir)) {
  console.error(`build.ts: ${sourceDir} not found; set LINESHIFT_SHARED_REFERENCE to the reference folder`);
  process.exit(2);
}

const EXPECTED_HEADER = 'wavelength_air_angstrom,relative_intensity,source_id,note';
const files = readdirSync(sourceDir).filter((f) => f.endsWith('.csv')).sort();
files.push('CHECKS.md');
let differ = 0;
for (const f of files) {
  const text = readFileSync(join(sourceDir, f));
  if (f.endsWith('.csv')) {
    const firstLine = text.toString('utf8').split(/\r?\n/, 1)[0];
    if (firstLine !== EXPECTED_HEADER) throw new Error(`${f}: unexpected header row "${firstLine}"`);
    const list = parseLineListCsv(text.toString('utf8'), f);
    console.log(`${f}: ${list.entries.length} lines of ${list.species.join(', ')}`);
  }
  const target = join(here, f);
  if (check) {
    const same = existsSync(target) && readFileSync(target).equals(text);
    if (!same) {
      console.error(`${f}: differs from ${join(sourceDir, f)}`);
      differ++;
    }
  } else {
    writeFileSync(target, text);
  }
}
if (check) {
  const extra = readdirSync(here).filter((f) => f.endsWith('.csv') && !files.includes(f));
  for (const f of extra) console.error(`${f}: not in ${sourceDir}`);
  differ += extra.length;
  console.log(differ === 0 ? `all ${files.length} files match` : `${differ} file(s) differ`);
  process.exit(differ === 0 ? 0 : 1);
}
