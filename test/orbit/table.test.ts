import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { InputError, UsageError } from '../../src/errors.js';
import { collectingLogger } from '../../src/logger.js';
import {
  createVelocityTable, formatVelocityTableCsv, isDoubleLined, parseVelocityTable, readVelocityTable, writeVelocityTable,
} from '../../src/orbit/table.js';

// Invented rows in the style of the demo scenario (LVAC-7, Larkspur Valley Astronomy Club; invented).
const CSV = [
  '# LVAC-7 velocities (invented)',
  'bjd_tdb,velocity_km_s,uncertainty_km_s,label',
  '2460412.41873,-12.31,0.84,night 1',
  '',
  '2460413.40211,3.5,0.9,"night 2, after clouds"',
  '2460415.39002,18.25,1.1,',
].join('\n');

function inputError(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return e as InputError;
  }
  throw new Error('expected an InputError');
}

describe('parseVelocityTable (CSV)', () => {
  it('reads columns, labels with quoted commas, comments and blank lines', () => {
    const t = parseVelocityTable(CSV, 'lvac7.csv');
    expect(Array.from(t.bjdTdb)).toEqual([2460412.41873, 2460413.40211, 2460415.39002]);
    expect(Array.from(t.velocityKmPerS)).toEqual([-12.31, 3.5, 18.25]);
    expect(Array.from(t.uncertaintyKmPerS)).toEqual([0.84, 0.9, 1.1]);
    expect(t.label).toEqual(['night 1', 'night 2, after clouds', '']);
    expect(t.velocity2KmPerS).toBeUndefined();
    expect(t.source).toEqual({ file: 'lvac7.csv', format: 'csv' });
    expect(t.provenance.at(-1)?.step).toBe('read-velocity-table');
    expect(Object.isFrozen(t)).toBe(true);
  });

  it('accepts any column order, upper-case names, CRLF and a byte-order mark', () => {
    const t = parseVelocityTable('\ufeffUNCERTAINTY_KM_S,BJD_TDB,Velocity_km_s\r\n0.5,2460000.5,1.25\r\n0.6,2460001.5,-1\r\n', 'x.csv');
    expect(Array.from(t.bjdTdb)).toEqual([2460000.5, 2460001.5]);
    expect(Array.from(t.velocityKmPerS)).toEqual([1.25, -1]);
    expect(Array.from(t.uncertaintyKmPerS)).toEqual([0.5, 0.6]);
  });

  it('reads a double-lined table with the second star missing on a blended night', () => {
    const t = parseVelocityTable('bjd_tdb,velocity_km_s,uncertainty_km_s,velocity2_km_s,uncertainty2_km_s\n1,10,1,-20,2\n2,0,1,,\n', 'sb2.csv');
    expect(Array.from(t.velocity2KmPerS!)).toEqual([-20, NaN]);
    expect(Array.from(t.uncertainty2KmPerS!)).toEqual([2, NaN]);
    expect(isDoubleLined(t)).toBe(true);
  });

  it.each([
    ['2460000.5,1,1\n', 'orbit.table-missing-header', 'x.csv: line 1: missing header row: the first line must name the columns (bjd_tdb, velocity_km_s, uncertainty_km_s), got "2460000.5"'],
    ['bjd_tdb,velocity_km_s\n1,2\n', 'orbit.table-missing-column', 'x.csv: line 1: missing column uncertainty_km_s'],
    ['bjd_tdb,velocity_km_s,uncertainty_km_s,velocity2_km_s\n1,2,3,4\n', 'orbit.table-missing-column', 'x.csv: line 1: column velocity2_km_s needs column uncertainty2_km_s too'],
    ['bjd_tdb,bjd_tdb,velocity_km_s,uncertainty_km_s\n', 'orbit.table-duplicate-column', 'x.csv: line 1: column bjd_tdb appears twice'],
    ['bjd_tdb,velocity_km_s,uncertainty_km_s\n1,2,3\n# note\n2,3\n', 'orbit.table-ragged', 'x.csv: line 4: row has 2 cells but the header has 3'],
    ['bjd_tdb,velocity_km_s,uncertainty_km_s\n1,2,3\n2,abc,3\n', 'orbit.table-not-number', 'x.csv: line 3: column velocity_km_s: not a number: "abc"'],
    ['bjd_tdb,velocity_km_s,uncertainty_km_s\n1,2,3\n2,0x10,3\n', 'orbit.table-not-number', 'x.csv: line 3: column velocity_km_s: not a number: "0x10"'],
    ['bjd_tdb,velocity_km_s,uncertainty_km_s\n1,,3\n', 'orbit.table-not-number', 'x.csv: line 2: column velocity_km_s: not a number: ""'],
    ['bjd_tdb,velocity_km_s,uncertainty_km_s\nNaN,2,3\n', 'orbit.table-not-number', 'x.csv: line 2: column bjd_tdb: not a number: "NaN"'],
    ['bjd_tdb,velocity_km_s,uncertainty_km_s\n1,1e999,3\n', 'orbit.table-not-finite', 'x.csv: line 2: column velocity_km_s: not a finite number: Infinity'],
    ['bjd_tdb,velocity_km_s,uncertainty_km_s\n1,2,3\n2,2,0\n', 'orbit.table-bad-uncertainty', 'x.csv: line 3: column uncertainty_km_s: uncertainty must be positive and finite, got 0 km/s'],
    ['bjd_tdb,velocity_km_s,uncertainty_km_s\n1,2,-0.5\n', 'orbit.table-bad-uncertainty', 'x.csv: line 2: column uncertainty_km_s: uncertainty must be positive and finite, got -0.5 km/s'],
    ['bjd_tdb,velocity_km_s,uncertainty_km_s,velocity2_km_s,uncertainty2_km_s\n1,2,1,5,\n', 'orbit.table-half-pair', 'x.csv: line 2: column uncertainty2_km_s: velocity2_km_s is given but uncertainty2_km_s is empty (give both or neither)'],
    ['bjd_tdb,velocity_km_s,uncertainty_km_s,velocity2_km_s,uncertainty2_km_s\n1,2,1,5,0\n', 'orbit.table-bad-uncertainty', 'x.csv: line 2: column uncertainty2_km_s: uncertainty must be positive and finite, got 0 km/s'],
    ['bjd_tdb,velocity_km_s,uncertainty_km_s,label\n1,2,3,"unclosed\n', 'orbit.table-unclosed-quote', 'x.csv: line 2: unclosed double quote'],
    ['bjd_tdb,velocity_km_s,uncertainty_km_s\n', 'orbit.table-empty', 'x.csv: line 1: the velocity table has no data rows'],
    ['# only a comment\n\n', 'orbit.table-empty', 'x.csv: the velocity table has no data rows'],
  ])('rejects %j', (text, code, message) => {
    const e = inputError(() => parseVelocityTable(text, 'x.csv'));
    expect(e.code).toBe(code);
    expect(e.message).toBe(message);
  });

  it('warns about repeated times and unknown columns but keeps the rows', () => {
    const log = collectingLogger();
    const t = parseVelocityTable('bjd_tdb,velocity_km_s,uncertainty_km_s,airmass\n1.5,2,3,1.2\n2.5,3,3,1.3\n1.5,4,3,1.1\n', 'x.csv', { logger: log });
    expect(t.bjdTdb.length).toBe(3);
    expect(log.warnings).toEqual([
      { code: 'orbit.unknown-column', message: 'x.csv: line 1: unknown column "airmass" ignored' },
      { code: 'orbit.duplicate-time', message: 'x.csv: line 4: time 1.5 repeats the time of line 2' },
    ]);
  });
});

describe('parseVelocityTable (JSON)', () => {
  const JSON_TEXT = `{
  "rows": [
    {"bjdTdb": 2460000.5, "velocityKmPerS": 1.5, "uncertaintyKmPerS": 0.5, "label": "a"},
    {"bjdTdb": 2460001.5, "velocityKmPerS": -2, "uncertaintyKmPerS": 0.5},
    {"bjdTdb": 2460002.5,
     "velocityKmPerS": -2, "uncertaintyKmPerS": 0}
  ]
}`;

  it('reads rows, and names the line of a bad row', () => {
    const e = inputError(() => parseVelocityTable(JSON_TEXT, 'v.json'));
    expect(e.code).toBe('orbit.table-bad-uncertainty');
    expect(e.message).toBe('v.json: line 5: column uncertaintyKmPerS: uncertainty must be positive and finite, got 0 km/s');
    const ok = parseVelocityTable(JSON_TEXT.replace('"uncertaintyKmPerS": 0}', '"uncertaintyKmPerS": 0.7}'), 'v.json');
    expect(Array.from(ok.velocityKmPerS)).toEqual([1.5, -2, -2]);
    expect(ok.label).toEqual(['a', '', '']);
    expect(ok.source?.format).toBe('json');
  });

  it('reads a bare array of rows', () => {
    const t = parseVelocityTable('[{"bjdTdb": 1, "velocityKmPerS": 2, "uncertaintyKmPerS": 3}]', 'v.json');
    expect(t.bjdTdb[0]).toBe(1);
  });

  it.each([
    ['{"rows": [1, 2', 'orbit.table-bad-json', /^v\.json: (line 1: )?not valid JSON: /],
    ['{"data": []}', 'orbit.table-json-shape', /^v\.json: expected a JSON object with a "rows" array/],
    ['{"rows": []}', 'orbit.table-empty', /^v\.json: the velocity table has no data rows$/],
    ['[\n"x"\n]', 'orbit.table-json-row', /^v\.json: line 2: each row must be a JSON object$/],
    ['[\n{"bjdTdb": 1, "velocityKmPerS": 2}\n]', 'orbit.table-missing-column', /^v\.json: line 2: column uncertaintyKmPerS: missing field uncertaintyKmPerS$/],
    ['[\n{"bjdTdb": "1", "velocityKmPerS": 2, "uncertaintyKmPerS": 1}\n]', 'orbit.table-not-number', /^v\.json: line 2: column bjdTdb: field bjdTdb must be a number, got "1"$/],
    ['[\n{"bjdTdb": 1, "velocityKmPerS": 2, "uncertaintyKmPerS": 1, "label": 5}\n]', 'orbit.table-json-label', /label must be a string, got 5$/],
  ])('rejects %j', (text, code, message) => {
    const e = inputError(() => parseVelocityTable(text, 'v.json'));
    expect(e.code).toBe(code);
    expect(e.message).toMatch(message);
  });
});

describe('writeVelocityTable', () => {
  const dir = mkdtempSync(join(tmpdir(), 'lineshift-table-'));
  const table = createVelocityTable({
    bjdTdb: [2460412.418730001, 2460413.4, 2460415.39],
    velocityKmPerS: [-12.31, 0.1 + 0.2, 18.25],
    uncertaintyKmPerS: [0.84, 0.9, 1.1],
    label: ['night 1', 'night "2", with comma,', '#3'],
    velocity2KmPerS: [20, NaN, -30],
    uncertainty2KmPerS: [2, NaN, 2.5],
  });

  it.each(['csv', 'json'] as const)('round-trips every value exactly through %s', (format) => {
    const path = join(dir, `rt.${format}`);
    writeVelocityTable(path, table);
    const back = readVelocityTable(path);
    expect(Array.from(back.bjdTdb)).toEqual(Array.from(table.bjdTdb));
    expect(Array.from(back.velocityKmPerS)).toEqual(Array.from(table.velocityKmPerS));
    expect(Array.from(back.uncertaintyKmPerS)).toEqual(Array.from(table.uncertaintyKmPerS));
    expect(Array.from(back.velocity2KmPerS!)).toEqual(Array.from(table.velocity2KmPerS!));
    expect(Array.from(back.uncertainty2KmPerS!)).toEqual(Array.from(table.uncertainty2KmPerS!));
    expect(back.label).toEqual(table.label);
    expect(back.provenance.map((p) => p.step)).toEqual(['write-velocity-table', 'read-velocity-table']);
    expect(back.source?.format).toBe(format);
  });

  it('leaves no temporary file and refuses to overwrite its own input', () => {
    const path = join(dir, 'own.csv');
    writeFileSync(path, formatVelocityTableCsv(table));
    const before = readFileSync(path, 'utf8');
    const read = readVelocityTable(path);
    expect(() => writeVelocityTable(path, read)).toThrow(UsageError);
    expect(() => writeVelocityTable(path, read)).toThrow(/refusing to overwrite the table's own input file/);
    expect(readFileSync(path, 'utf8')).toBe(before);
    expect(readdirSync(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });
});

describe('createVelocityTable', () => {
  it('copies its inputs and never changes them', () => {
    const t = [3, 1, 2];
    const init = Object.freeze({ bjdTdb: Object.freeze(t), velocityKmPerS: Object.freeze([1, 2, 3]), uncertaintyKmPerS: Object.freeze([1, 1, 1]) });
    const table = createVelocityTable(init);
    expect(Array.from(table.bjdTdb)).toEqual([3, 1, 2]);
    expect(table.bjdTdb).not.toBe(init.bjdTdb);
  });
  it('rejects mismatched lengths and half a second-star pair', () => {
    expect(() => createVelocityTable({ bjdTdb: [1, 2], velocityKmPerS: [1], uncertaintyKmPerS: [1, 1] })).toThrow('velocityKmPerS has 1 values but bjdTdb has 2');
    expect(() => createVelocityTable({ bjdTdb: [1], velocityKmPerS: [1], uncertaintyKmPerS: [1], velocity2KmPerS: [1] })).toThrow('velocity2KmPerS needs column uncertainty2KmPerS too');
    expect(() => createVelocityTable({ bjdTdb: [1], velocityKmPerS: [1], uncertaintyKmPerS: [1], velocity2KmPerS: [1], uncertainty2KmPerS: [NaN] }, { file: 'x' }))
      .toThrow('x: column velocity2KmPerS: index 0: velocity2KmPerS is given but uncertainty2KmPerS is empty (give both or neither)');
  });
});
