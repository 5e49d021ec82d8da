/**
 * Every user-facing message of the orbit area, in one place and one format: lower case,
 * no trailing full stop, the offending value quoted, units stated. Errors add their
 * location prefix (`file: line 7: column velocity_km_s: ...`) through `InputError`.
 */

/** Canonical CSV column names of a velocity table (see `table.ts`). */
export const TABLE_COLUMNS = {
  time: 'bjd_tdb',
  velocity: 'velocity_km_s',
  uncertainty: 'uncertainty_km_s',
  velocity2: 'velocity2_km_s',
  uncertainty2: 'uncertainty2_km_s',
  label: 'label',
} as const;

const fmt = (x: number): string => (Number.isFinite(x) ? String(x) : String(x));

export const messages = {
  tableEmpty: () => 'the velocity table has no data rows',
  tableMissingHeader: (firstCell: string) =>
    `missing header row: the first line must name the columns (${TABLE_COLUMNS.time}, ${TABLE_COLUMNS.velocity}, ${TABLE_COLUMNS.uncertainty}), got "${firstCell}"`,
  tableMissingColumn: (name: string) => `missing column ${name}`,
  tableDuplicateColumn: (name: string) => `column ${name} appears twice`,
  tableUnknownColumn: (name: string) => `unknown column "${name}" ignored`,
  tablePairIncomplete: (present: string, missing: string) => `column ${present} needs column ${missing} too`,
  tableRagged: (cells: number, expected: number) => `row has ${cells} cells but the header has ${expected}`,
  tableNotNumber: (text: string) => `not a number: "${text}"`,
  tableNotFinite: (value: number) => `not a finite number: ${fmt(value)}`,
  tableBadUncertainty: (value: number) => `uncertainty must be positive and finite, got ${fmt(value)} km/s`,
  tableHalfPair: (present: string, missing: string) => `${present} is given but ${missing} is empty (give both or neither)`,
  tableDuplicateTime: (time: number, firstWhere: string) => `time ${fmt(time)} repeats the time of ${firstWhere}`,
  tableUnclosedQuote: () => 'unclosed double quote',
  tableBadJson: (detail: string) => `not valid JSON: ${detail}`,
  tableJsonShape: () => 'expected a JSON object with a "rows" array (or a bare array of rows)',
  tableJsonRow: () => 'each row must be a JSON object',
  tableJsonMissing: (field: string) => `missing field ${field}`,
  tableJsonNotNumber: (field: string, value: unknown) => `field ${field} must be a number, got ${JSON.stringify(value)}`,
  tableJsonLabel: (value: unknown) => `label must be a string, got ${JSON.stringify(value)}`,
  tableLengths: (name: string, n: number, expected: number) => `${name} has ${n} values but bjdTdb has ${expected}`,
  tableBadProvenance: () => 'provenance comment is not valid JSON; ignored',
  writeOverInput: (path: string) => `refusing to overwrite the table's own input file ${path}`,
  writeFormat: (format: string) => `unknown table format "${format}" (use csv or json)`,

  tooFewPoints: (n: number, needed: number, what: string) => `${what} needs at least ${needed} velocities, got ${n}`,
  zeroSpan: () => 'all times are equal: the time span is zero',
  periodRange: (minP: number, maxP: number) => `the minimum period (${fmt(minP)} d) must be positive and below the maximum period (${fmt(maxP)} d)`,
  badOption: (name: string, value: unknown, expect: string) => `option ${name} must be ${expect}, got ${JSON.stringify(value)}`,
  gridTooLarge: (count: number, limit: number, spanDays: number, minPeriodDays: number) =>
    `the frequency grid would hold ${count} frequencies (more than ${limit}) for a time span of ${fmt(spanDays)} d and a minimum period of ${fmt(minPeriodDays)} d; raise the minimum period or check that the times are in days`,
  lengthMismatch: (name: string, n: number, expected: number) => `${name} has ${n} values but the times have ${expected}`,

  badEccentricity: (e: number) => `eccentricity must be in [0, 1), got ${fmt(e)}`,
  badMeanAnomaly: (m: number) => `mean anomaly must be finite, got ${fmt(m)}`,
  badPeriod: (p: number) => `period must be positive and finite, got ${fmt(p)} d`,
  badSemiAmplitude: (k: number) => `semi-amplitude must be finite, got ${fmt(k)} km/s`,

  noK2: () => 'the orbit has no semiAmplitude2KmPerS for the secondary star',
  covarianceSize: (n: number) => `the covariance must be ${n}×${n} for ${n} gradient values`,
  cliBadJitter: (text: string) => `option --jitter needs "estimate" or a number ≥ 0 (km/s), got "${text}"`,
  noSecondary: () => 'a double-lined fit needs velocity2_km_s and uncertainty2_km_s columns with at least one value',
  fitLargeChi2: (reducedChi2: number) =>
    `reduced chi-square of the orbit fit is ${reducedChi2.toFixed(2)}: the uncertainties look too small or the model does not fit; consider a jitter term`,
  fitNotConverged: (reason: string) => `the orbit fit did not converge: ${reason}`,
  periodBeyondSpan: (periodDays: number, spanDays: number) =>
    `the fitted period (${fmt(periodDays)} d) is longer than the time span of the data (${fmt(spanDays)} d): it is poorly constrained`,
} as const;
