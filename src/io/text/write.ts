/**
 * Writer for spectra as delimited text (CSV or TSV) that {@link parseTextSpectrum} reads back
 * exactly.
 */
import { existsSync, realpathSync, statSync } from 'node:fs';
import { writeFileAtomic } from '../atomic-write.js';
import { basename, dirname, join, resolve } from 'node:path';
import { UsageError } from '../../errors.js';
import type { HeaderCard } from '../../spectrum/header.js';
import type { Spectrum } from '../../spectrum/spectrum.js';
import { unitSymbol } from '../../spectrum/units.js';
import { LIBRARY_NAME, VERSION } from '../../version.js';

/** Options of {@link formatTextSpectrum} and {@link writeTextSpectrum}. */
export interface TextWriteOptions {
  /** `csv` (comma-separated, the default) or `tsv` (tab-separated). */
  format?: 'csv' | 'tsv';
  /** Extra comment lines written after the first line (without the `#`). */
  comments?: readonly string[];
}

/** Default of {@link TextWriteOptions.format}. */
const DEFAULT_FORMAT = 'csv';

/**
 * A number as the shortest decimal text that reads back to the same double (ECMAScript
 * `Number.prototype.toString`), keeping the sign of −0; NaN and infinities as `NaN`,
 * `Infinity`, `-Infinity`.
 */
function formatNumber(x: number): string {
  return Object.is(x, -0) ? '-0' : String(x);
}

function quoteCell(cell: string, delimiter: string): string {
  if (/[\r\n]/.test(cell)) throw new UsageError('text.unwritable', `cannot write a header cell holding a line break: ${JSON.stringify(cell)}`);
  const needs = cell.includes(delimiter) || cell.includes('"') || cell.includes('#') || cell !== cell.trim() || cell === '';
  return needs ? `"${cell.replace(/"/g, '""')}"` : cell;
}

function cardJson(card: HeaderCard): string {
  const o: Record<string, unknown> = { keyword: card.keyword };
  if (typeof card.value === 'bigint') o.bigint = card.value.toString();
  else if (card.value !== undefined) o.value = card.value;
  if (card.text !== undefined) o.text = card.text;
  if (card.comment !== undefined) o.comment = card.comment;
  if (card.rawValue !== undefined) o.rawValue = card.rawValue;
  return JSON.stringify(o);
}

/**
 * Formats a spectrum as CSV or TSV text: comment lines (`#`) with the medium, the header
 * cards and the provenance (one JSON object per line), a header row naming the columns
 * and their units (`wavelength [nm]`, `flux [adu]`, `uncertainty [adu]`, `mask`), then one
 * row per pixel. Numbers are written as the shortest text that reads back to the same
 * double, so {@link parseTextSpectrum} on the result gives back the same arrays, unit,
 * medium, flux unit, header cards and provenance (plus its own `read-text` entry). The
 * flux unit is written trimmed (an empty one reads back as null); header-card values and
 * provenance parameters go through JSON, so they must be JSON-safe (no NaN, no −0).
 *
 * @param spectrum the spectrum to write (not modified).
 * @param options `format` (`csv`, the default, or `tsv`) and extra `comments`.
 * @returns the text, ending with a line feed.
 * @throws {UsageError} when the flux unit holds a line break (it could not be read back).
 * @example
 * const s = createSpectrum({ wavelength: [6562, 6563], flux: [1, 0.5], unit: 'angstrom', medium: 'air' });
 * formatTextSpectrum(s).trimEnd().split('\n').slice(-3).join('|');
 * // 'wavelength [Angstrom],flux|6562,1|6563,0.5'
 */
export function formatTextSpectrum(spectrum: Spectrum, options: TextWriteOptions = {}): string {
  const format = options.format ?? DEFAULT_FORMAT;
  if (format !== 'csv' && format !== 'tsv') throw new UsageError('text.bad-format', `unknown text format "${String(format)}" (expected csv or tsv)`);
  const d = format === 'csv' ? ',' : '\t';
  const out: string[] = [`# spectrum written by ${LIBRARY_NAME} ${VERSION}`];
  for (const c of options.comments ?? []) for (const l of c.split(/\r\n|\r|\n/)) out.push(l === '' ? '#' : `# ${l}`);
  out.push(`# medium: ${spectrum.medium ?? 'unknown'}`);
  for (const card of spectrum.header.cards) out.push(`# header: ${cardJson(card)}`);
  for (const p of spectrum.provenance) out.push(`# provenance: ${JSON.stringify({ step: p.step, parameters: p.parameters, version: p.version })}`);

  const fluxUnit = spectrum.fluxUnit === null ? '' : spectrum.fluxUnit.trim();
  const cols = [`wavelength [${unitSymbol(spectrum.unit)}]`, fluxUnit === '' ? 'flux' : `flux [${fluxUnit}]`];
  const u = spectrum.uncertainty;
  const m = spectrum.mask;
  if (u) cols.push(fluxUnit === '' ? 'uncertainty' : `uncertainty [${fluxUnit}]`);
  if (m) cols.push('mask');
  out.push(cols.map((c) => quoteCell(c, d)).join(d));
  const w = spectrum.wavelength;
  const f = spectrum.flux;
  for (let i = 0; i < w.length; i++) {
    let row = formatNumber(w[i]) + d + formatNumber(f[i]);
    if (u) row += d + formatNumber(u[i]);
    if (m) row += d + String(m[i]);
    out.push(row);
  }
  return out.join('\n') + '\n';
}

function realPathOf(path: string): string {
  const abs = resolve(path);
  if (existsSync(abs)) return realpathSync(abs);
  const dir = dirname(abs);
  return join(existsSync(dir) ? realpathSync(dir) : dir, basename(abs));
}

function sameFile(a: string, b: string): boolean {
  if (realPathOf(a) === realPathOf(b)) return true;
  try {
    const sa = statSync(a);
    const sb = statSync(b);
    return sa.dev === sb.dev && sa.ino === sb.ino;
  } catch {
    return false;
  }
}

/**
 * Writes a spectrum as CSV or TSV (see {@link formatTextSpectrum}). The text goes to a
 * temporary file in the same folder, which is then renamed over `path`, so a reader never
 * sees a half-written file; an existing file at `path` is replaced.
 *
 * @param path output file path.
 * @param spectrum the spectrum to write (not modified).
 * @param options as for {@link formatTextSpectrum}.
 * @throws {UsageError} `text.overwrite-input` when `path` is the file the spectrum was read
 *   from (`spectrum.source.file`, compared by real path and by inode), or `path` is a folder.
 * @example
 * writeTextSpectrum('lvac7-resampled.csv', resampled, { format: 'csv' });
 */
export function writeTextSpectrum(path: string, spectrum: Spectrum, options: TextWriteOptions = {}): void {
  const source = spectrum.source?.file;
  if (source !== undefined && sameFile(path, source)) {
    throw new UsageError('text.overwrite-input', `refusing to overwrite the spectrum's own input file ${source}; choose another output name`, { file: path });
  }
  if (existsSync(path) && statSync(path).isDirectory()) {
    throw new UsageError('text.output-is-directory', 'the output path is a folder, not a file', { file: path });
  }
  const text = formatTextSpectrum(spectrum, options);
  writeFileAtomic(path, text);
}
