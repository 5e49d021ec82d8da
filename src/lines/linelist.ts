/**
 * Line lists: laboratory wavelengths of calibration-lamp lines (neon, argon, mercury,
 * helium, krypton, xenon, hydrogen) and of stellar and nebular lines, shipped in
 * data/linelists/ (one CSV per spectrum, with SOURCES.md), plus users' own lists in the
 * same format.
 */
import { readFileSync, readdirSync, statSync } from 'node:fs';
import { basename, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { InputError, UsageError, type ErrorLocation } from '../errors.js';
import { readColumnHeading } from '../io/text/columns.js';
import { decodeText, detectDelimiter, joinBracketedUnits, parseNumberCell, splitFields, textLines, type TextLine } from '../io/text/fields.js';
import { airToVacuum, vacuumToAir, type AirVacuumOptions } from '../spectrum/air-vacuum.js';
import { convertWavelength } from '../spectrum/units.js';

/** One line of a line list. */
export interface LineEntry {
  /** Laboratory wavelength in Å, in `medium`. */
  readonly wavelengthAngstrom: number;
  /** `air` (standard air, as the shipped lists) or `vacuum`. */
  readonly medium: 'air' | 'vacuum';
  /** Spectrum the line belongs to, e.g. `Ne I`, `Fe II` (forbidden lines too: [O III] is `O III`). */
  readonly species: string;
  /** Relative intensity on the list's own scale (NIST Handbook scale, per element), or null when unknown. */
  readonly relativeIntensity: number | null;
  /** Where the wavelength comes from: a `source_id` of data/linelists/SOURCES.md, or the user's own. */
  readonly source: string;
  /** Transition, vacuum wavelength and cross-checks, as given in the list. */
  readonly note: string;
  /** True when the value is a weighted mean over fine-structure components (hydrogenic blends, He I multiplet centroids) rather than one transition. */
  readonly blend: boolean;
}

/** A line list: entries sorted by wavelength. */
export interface LineList {
  /** The spectra it holds, e.g. `['Ne I', 'Ar I']`. */
  readonly species: readonly string[];
  /** Medium of every entry's wavelength. */
  readonly medium: 'air' | 'vacuum';
  /** The lines, in increasing wavelength. */
  readonly entries: readonly LineEntry[];
}

/**
 * Lamp names and the spectra they show. A comma- or plus-separated combination such as
 * `neon,argon` joins the lists.
 */
export const LAMP_PRESETS: Readonly<Record<string, readonly string[]>> = Object.freeze({
  neon: Object.freeze(['Ne I']),
  argon: Object.freeze(['Ar I']),
  mercury: Object.freeze(['Hg I']),
  helium: Object.freeze(['He I']),
  krypton: Object.freeze(['Kr I']),
  xenon: Object.freeze(['Xe I']),
  hydrogen: Object.freeze(['H I']),
});

/** The folder of the shipped lists: data/linelists/ two levels above this module (src/lines or dist/lines). */
export const LINE_LIST_DIR = fileURLToPath(new URL('../../data/linelists/', import.meta.url));

const BLEND_NOTE = /fine-structure blend|multiplet centroid/i;

/** `Ne_I.csv` → `Ne I`, `O2_telluric.csv` → `O2 telluric`. */
function speciesFromFileName(file: string): string {
  return basename(file).replace(/\.[^.]*$/, '').replace(/_+/g, ' ').trim();
}

function speciesKey(name: string): string {
  return name.trim().replace(/[_\s]+/g, ' ').toLowerCase();
}

let shippedIndex: Map<string, string> | undefined;

/** Map from species key to file name of the shipped lists. */
function shipped(): Map<string, string> {
  if (!shippedIndex) {
    shippedIndex = new Map();
    for (const f of readdirSync(LINE_LIST_DIR).filter((x) => x.endsWith('.csv')).sort()) {
      shippedIndex.set(speciesKey(speciesFromFileName(f)), f);
    }
  }
  return shippedIndex;
}

const cache = new Map<string, LineList>();

/**
 * The spectra whose line lists ship with the library, e.g. `['Ar I', 'Ar III', 'Ca I', …]`.
 *
 * @returns species names in alphabetical order of their files.
 * @example availableSpecies().includes('Ne I'); // true
 */
export function availableSpecies(): string[] {
  return [...shipped().values()].map(speciesFromFileName);
}

/**
 * Loads shipped line lists (data/linelists/) by species, joined into one list sorted by
 * wavelength. Wavelengths are in standard air, Å (see data/linelists/SOURCES.md for each
 * source). Names are matched in any case, with `_` or a space between element and stage.
 *
 * @param species one name or several, e.g. `'Ne I'` or `['Ne I', 'Ar I']`; see {@link availableSpecies}.
 * @returns the joined list (a fresh value; the entries are frozen).
 * @throws {UsageError} `linelist.unknown-species` naming the species that do not exist.
 * @example
 * const ne = loadLineList('Ne I');
 * ne.entries.find((e) => Math.abs(e.wavelengthAngstrom - 6402.25) < 0.01)?.relativeIntensity; // 200 (NIST Handbook scale)
 */
export function loadLineList(species: string | readonly string[]): LineList {
  const names = typeof species === 'string' ? [species] : [...species];
  if (names.length === 0) throw new UsageError('linelist.no-species', 'name at least one species (e.g. "Ne I")');
  const lists: LineList[] = [];
  for (const name of names) {
    const file = shipped().get(speciesKey(name));
    if (!file) {
      throw new UsageError('linelist.unknown-species', `no line list for "${name}" (available: ${availableSpecies().join(', ')})`);
    }
    let list = cache.get(file);
    if (!list) {
      const path = join(LINE_LIST_DIR, file);
      list = parseLineListCsv(readFileSync(path), path);
      cache.set(file, list);
    }
    lists.push(list);
  }
  return mergeLineLists(lists);
}

/**
 * The line list of a calibration lamp, by name: `neon`, `argon`, `mercury`, `helium`,
 * `krypton`, `xenon`, `hydrogen` (see {@link LAMP_PRESETS}), or a combination such as
 * `neon,argon` or `mercury+argon` for a lamp filled with several gases. Names are matched
 * in any case.
 *
 * @param lamp lamp name or comma/plus-separated names.
 * @returns the joined list, air wavelengths in Å.
 * @throws {UsageError} `linelist.unknown-lamp` for a name not in {@link LAMP_PRESETS}.
 * @example lampLineList('neon,argon').species; // ['Ne I', 'Ar I']
 */
export function lampLineList(lamp: string): LineList {
  const names = lamp.split(/[,+]/).map((s) => s.trim().toLowerCase()).filter((s) => s.length > 0);
  if (names.length === 0) throw new UsageError('linelist.unknown-lamp', `name a lamp (known: ${Object.keys(LAMP_PRESETS).join(', ')})`);
  const species: string[] = [];
  for (const n of names) {
    if (!Object.prototype.hasOwnProperty.call(LAMP_PRESETS, n)) {
      throw new UsageError('linelist.unknown-lamp', `unknown lamp "${n}" (known: ${Object.keys(LAMP_PRESETS).join(', ')}; combine them as "neon,argon")`);
    }
    for (const s of LAMP_PRESETS[n]) if (!species.includes(s)) species.push(s);
  }
  return loadLineList(species);
}

/**
 * Joins line lists into one, sorted by wavelength (ties keep the order of the inputs).
 *
 * @param lists lists in the same medium.
 * @returns the joined list; its species are those of the inputs, in order, without repeats.
 * @throws {UsageError} `linelist.mixed-media` when air and vacuum lists are mixed.
 * @example mergeLineLists([loadLineList('Ne I'), loadLineList('Ar I')]).species; // ['Ne I', 'Ar I']
 */
export function mergeLineLists(lists: readonly LineList[]): LineList {
  if (lists.length === 0) return Object.freeze({ species: Object.freeze([]), medium: 'air', entries: Object.freeze([]) });
  const medium = lists[0].medium;
  if (lists.some((l) => l.medium !== medium)) {
    throw new UsageError('linelist.mixed-media', 'cannot join air and vacuum line lists; convert one first (lineListToVacuum or lineListToAir)');
  }
  const species: string[] = [];
  for (const l of lists) for (const s of l.species) if (!species.includes(s)) species.push(s);
  const entries = lists.flatMap((l) => l.entries).map((e, i) => [e, i] as const);
  entries.sort((a, b) => a[0].wavelengthAngstrom - b[0].wavelengthAngstrom || a[1] - b[1]);
  return Object.freeze({ species: Object.freeze(species), medium, entries: Object.freeze(entries.map((x) => x[0])) });
}

/** Options of {@link filterLineList}. */
export interface LineListFilter {
  /** Keep lines at or above this wavelength, Å (in the list's medium). */
  minWavelengthAngstrom?: number;
  /** Keep lines at or below this wavelength, Å. */
  maxWavelengthAngstrom?: number;
  /** Keep lines with a relative intensity at least this; lines without an intensity are dropped when this is set. */
  minRelativeIntensity?: number;
  /** `include` (default) keeps blends and single transitions, `exclude` drops blends, `only` keeps only blends. */
  blends?: 'include' | 'exclude' | 'only';
  /** Keep only these species (any case). */
  species?: readonly string[];
}

/**
 * The lines of a list that pass a filter: a wavelength range (both ends included), a
 * minimum relative intensity (lines of unknown intensity are then dropped; intensity scales
 * differ between elements), blends or not, and species.
 *
 * @param list the list (not modified).
 * @param filter the conditions; an empty filter keeps everything.
 * @returns a new list with the entries that pass.
 * @throws {UsageError} when min > max or a bound is NaN.
 * @example
 * filterLineList(loadLineList('Ne I'), { minWavelengthAngstrom: 5800, maxWavelengthAngstrom: 7100, minRelativeIntensity: 150 }).entries.length; // 6
 */
export function filterLineList(list: LineList, filter: LineListFilter = {}): LineList {
  const lo = filter.minWavelengthAngstrom ?? -Infinity;
  const hi = filter.maxWavelengthAngstrom ?? Infinity;
  if (Number.isNaN(lo) || Number.isNaN(hi) || lo > hi) {
    throw new UsageError('linelist.bad-range', `the wavelength range of the filter is empty or not a number (${lo} to ${hi} Å)`);
  }
  const minI = filter.minRelativeIntensity;
  if (minI !== undefined && Number.isNaN(minI)) throw new UsageError('linelist.bad-intensity', 'minRelativeIntensity is NaN');
  const blends = filter.blends ?? 'include';
  const keep = filter.species ? new Set(filter.species.map(speciesKey)) : undefined;
  const entries = list.entries.filter((e) => {
    if (e.wavelengthAngstrom < lo || e.wavelengthAngstrom > hi) return false;
    if (minI !== undefined && (e.relativeIntensity === null || e.relativeIntensity < minI)) return false;
    if (blends === 'exclude' && e.blend) return false;
    if (blends === 'only' && !e.blend) return false;
    if (keep && !keep.has(speciesKey(e.species))) return false;
    return true;
  });
  const species = keep ? list.species.filter((s) => keep.has(speciesKey(s))) : list.species;
  return Object.freeze({ species: Object.freeze([...species]), medium: list.medium, entries: Object.freeze(entries) });
}

function convertList(list: LineList, to: 'air' | 'vacuum', options: AirVacuumOptions | undefined): LineList {
  if (list.medium === to) return list;
  const f = to === 'vacuum' ? airToVacuum : vacuumToAir;
  const entries = list.entries.map((e) => Object.freeze({ ...e, wavelengthAngstrom: f(e.wavelengthAngstrom, options), medium: to }));
  return Object.freeze({ species: list.species, medium: to, entries: Object.freeze(entries) });
}

/**
 * The list with vacuum wavelengths (λ_vac from λ_air by {@link airToVacuum}, Peck & Reeder
 * 1972 unless `formula` says otherwise). A vacuum list is returned as is.
 *
 * @param list the list (not modified).
 * @param options `formula` of the air/vacuum conversion.
 * @returns a new list with `medium: 'vacuum'`.
 * @throws {UsageError} for a line outside 2000–25 000 Å.
 * @example lineListToVacuum(loadLineList('H I')).entries.find((e) => e.note.includes('H-alpha'))?.wavelengthAngstrom; // 6564.6079…
 */
export function lineListToVacuum(list: LineList, options?: AirVacuumOptions): LineList {
  return convertList(list, 'vacuum', options);
}

/**
 * The list with air wavelengths (by {@link vacuumToAir}); an air list is returned as is.
 *
 * @param list the list (not modified).
 * @param options `formula` of the air/vacuum conversion.
 * @returns a new list with `medium: 'air'`.
 * @throws {UsageError} for a line outside 2000–25 000 Å.
 * @example lineListToAir(lineListToVacuum(loadLineList('Hg I'))).entries[0].wavelengthAngstrom; // 3650.153 (to 10⁻¹¹ Å)
 */
export function lineListToAir(list: LineList, options?: AirVacuumOptions): LineList {
  return convertList(list, 'air', options);
}

/** Options of {@link parseLineListCsv} and {@link readLineList}. */
export interface LineListReadOptions {
  /** Species of every line when the file has no `species` column; default: from the file name (`Ne_I.csv` → `Ne I`). */
  species?: string;
  /** Medium of the wavelengths when the wavelength column's name does not say (`wavelength_air_angstrom` says air). */
  medium?: 'air' | 'vacuum';
}

type ListColumn = 'wavelength' | 'intensity' | 'source' | 'note' | 'species';

function listColumnRole(cell: string): ListColumn | null {
  const k = cell.trim().toLowerCase().replace(/[\s_-]+/g, '_');
  if (/^(relative_)?intensity$|^rel_int$|^int$/.test(k)) return 'intensity';
  if (k === 'source_id' || k === 'source') return 'source';
  if (k === 'note' || k === 'notes' || k === 'comment') return 'note';
  if (k === 'species' || k === 'ion' || k === 'spectrum') return 'species';
  return null;
}

/**
 * Parses a line list in the shipped CSV format: a header row with
 * `wavelength_air_angstrom` (or `wavelength_vacuum_angstrom`, or `wavelength [nm, air]` and
 * the like), and optionally `relative_intensity`, `source_id`, `note` and `species`; comment
 * lines start with `#`; fields with commas are quoted. Comma, tab, semicolon or whitespace
 * delimiters are told apart from the content. Rows need not be sorted.
 *
 * @param text the file's content (bytes or text).
 * @param name file name, used in messages and (by default) for the species.
 * @param options `species` and `medium` when the file does not say.
 * @returns the list, sorted by wavelength, wavelengths converted to Å.
 * @throws {InputError} with file, line and column for: no header row, no wavelength
 *   column, an unknown medium, ragged rows, a wavelength that is not a positive finite
 *   number, an intensity that is not a non-negative number, no lines.
 * @example
 * parseLineListCsv('wavelength_air_angstrom,relative_intensity\n6402.248,20000\n', 'my_Ne_I.csv').entries[0].species; // 'my Ne I'
 */
export function parseLineListCsv(text: string | Uint8Array, name: string, options: LineListReadOptions = {}): LineList {
  const file = name;
  const content = typeof text === 'string' ? text.replace(/^\ufeff/, '') : decodeText(text, file);
  const lines: TextLine[] = [];
  for (const l of textLines(content, file)) {
    const t = l.text.trim();
    if (t !== '' && !t.startsWith('#')) lines.push(l);
  }
  if (lines.length === 0) throw new InputError('linelist.empty', 'the file holds no header row and no lines', { file });
  const delimiter = detectDelimiter(lines.slice(0, 20).map((l) => l.text));
  const headerLine = lines[0];
  const headerWhere: ErrorLocation = { file, line: headerLine.number };
  const headerFields = splitFields(headerLine.text, delimiter, headerWhere);
  const header = delimiter === 'whitespace' ? joinBracketedUnits(headerFields) : headerFields;
  if (header.every((h) => h === '' || parseNumberCell(h) !== undefined)) {
    throw new InputError('linelist.no-header', 'the first row is not a header row; name the columns, e.g. "wavelength_air_angstrom,relative_intensity,source_id,note"', headerWhere);
  }
  const roles: (ListColumn | null)[] = [];
  let medium: 'air' | 'vacuum' | undefined;
  let unitScale = 1;
  for (let i = 0; i < header.length; i++) {
    const h = header[i];
    const role = listColumnRole(h);
    if (role) {
      roles.push(role);
      continue;
    }
    const heading = readColumnHeading(h, { ...headerWhere, column: String(i + 1) });
    if (heading.role === 'wavelength') {
      roles.push('wavelength');
      medium = heading.medium;
      if (heading.unit === 'pixel') throw new InputError('linelist.bad-unit', 'a line list needs wavelengths, not pixels', { ...headerWhere, column: String(i + 1) });
      unitScale = heading.unit ? convertWavelength(1, heading.unit, 'angstrom') : 1;
    } else {
      roles.push(null);
    }
  }
  const col = (r: ListColumn) => roles.indexOf(r);
  const wCol = col('wavelength');
  if (wCol < 0) {
    throw new InputError('linelist.no-wavelength', `the header row names no wavelength column (columns: ${header.map((h) => `"${h}"`).join(', ')}); expected e.g. "wavelength_air_angstrom"`, headerWhere);
  }
  const fileMedium = medium;
  if (fileMedium && options.medium && fileMedium !== options.medium) {
    throw new InputError('linelist.conflicting-medium', `the wavelength column says ${fileMedium} but the medium option says ${options.medium}`, { ...headerWhere, column: String(wCol + 1) });
  }
  const listMedium = fileMedium ?? options.medium;
  if (!listMedium) {
    throw new InputError('linelist.no-medium', `the wavelength column "${header[wCol]}" does not say air or vacuum; name it wavelength_air_angstrom or wavelength_vacuum_angstrom, or pass the medium option`, { ...headerWhere, column: String(wCol + 1) });
  }
  const iCol = col('intensity');
  const sCol = col('source');
  const nCol = col('note');
  const spCol = col('species');
  const defaultSpecies = options.species ?? speciesFromFileName(file);
  const entries: LineEntry[] = [];
  for (let r = 1; r < lines.length; r++) {
    const line = lines[r];
    const where: ErrorLocation = { file, line: line.number };
    const f = splitFields(line.text, delimiter, where);
    if (f.length !== header.length) {
      throw new InputError('linelist.ragged-row', `the row has ${f.length} column${f.length === 1 ? '' : 's'}, but the header row (line ${headerLine.number}) has ${header.length}`, where);
    }
    const w = parseNumberCell(f[wCol]);
    if (w === undefined || !(w > 0) || !Number.isFinite(w)) {
      throw new InputError('linelist.bad-wavelength', `the wavelength "${f[wCol]}" is not a positive number`, { ...where, column: String(wCol + 1) });
    }
    let intensity: number | null = null;
    if (iCol >= 0 && f[iCol] !== '') {
      const v = parseNumberCell(f[iCol]);
      if (v === undefined || !Number.isFinite(v) || v < 0) {
        throw new InputError('linelist.bad-intensity', `the relative intensity "${f[iCol]}" is not a non-negative number`, { ...where, column: String(iCol + 1) });
      }
      intensity = v;
    }
    const note = nCol >= 0 ? f[nCol] : '';
    const species = spCol >= 0 && f[spCol] !== '' ? f[spCol] : defaultSpecies;
    entries.push(
      Object.freeze({
        wavelengthAngstrom: w * unitScale,
        medium: listMedium,
        species,
        relativeIntensity: intensity,
        source: sCol >= 0 && f[sCol] !== '' ? f[sCol] : 'user',
        note,
        blend: BLEND_NOTE.test(note),
      }),
    );
  }
  if (entries.length === 0) throw new InputError('linelist.empty', 'the file holds a header row but no lines', headerWhere);
  const species: string[] = [];
  for (const e of entries) if (!species.includes(e.species)) species.push(e.species);
  return mergeLineLists([Object.freeze({ species: Object.freeze(species), medium: listMedium, entries: Object.freeze(entries) })]);
}

/**
 * Reads a user's line list from a CSV file in the shipped format (see {@link parseLineListCsv}).
 *
 * @param path file path.
 * @param options `species` (default from the file name) and `medium` when the file does not say.
 * @returns the list, sorted by wavelength.
 * @throws {InputError} when the file is missing, a folder, or malformed (with line numbers).
 * @example readLineList('my-lamp.csv', { species: 'Ne I' }).entries.length;
 */
export function readLineList(path: string, options: LineListReadOptions = {}): LineList {
  let bytes: Buffer;
  try {
    if (statSync(path).isDirectory()) throw new InputError('io.is-directory', 'is a directory, not a file', { file: path });
    bytes = readFileSync(path);
  } catch (e) {
    if (e instanceof InputError) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError('io.cannot-open', code === 'ENOENT' ? 'no such file' : `cannot open (${code ?? String(e)})`, { file: path });
  }
  return parseLineListCsv(bytes, path, options);
}
