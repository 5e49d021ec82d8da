/**
 * The contract every plot spec must meet: it validates against the Vega-Lite JSON schema
 * shipped with vega-lite, and vega-lite compiles it without a warning.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { Ajv, type ValidateFunction } from 'ajv';
import { expect } from 'vitest';
import { compileVegaLite } from '../../src/plot/render.js';
import { vegaLiteConfig } from '../../src/plot/theme.js';
import type { VegaLiteSpec } from '../../src/plot/spec.js';

let validator: ValidateFunction | undefined;

/** The Vega-Lite schema validator (compiled once per test file). */
export function vegaLiteValidator(): ValidateFunction {
  if (!validator) {
    const schemaPath = createRequire(import.meta.url).resolve('vega-lite/vega-lite-schema.json');
    const schema = JSON.parse(readFileSync(schemaPath, 'utf8')) as object;
    // The schema uses union types and custom formats (color-hex, uri); formats are not part of the contract we check.
    const ajv = new Ajv({ allErrors: true, strict: false, allowUnionTypes: true, validateFormats: false });
    validator = ajv.compile(schema);
  }
  return validator;
}

/** Readable schema errors: the deepest few, without the anyOf noise. */
export function schemaErrors(spec: unknown): string[] {
  const validate = vegaLiteValidator();
  if (validate(JSON.parse(JSON.stringify(spec)))) return [];
  return (validate.errors ?? [])
    .filter((e) => e.keyword !== 'anyOf')
    .sort((a, b) => b.instancePath.length - a.instancePath.length)
    .slice(0, 5)
    .map((e) => `${e.instancePath || '/'} ${e.message ?? ''} ${JSON.stringify(e.params)}`);
}

/** Asserts the contract: JSON-clean, schema-valid, compiles without warnings. */
export async function expectValidSpec(spec: VegaLiteSpec): Promise<void> {
  // JSON round trip must not change it: no NaN, Infinity, undefined or functions inside.
  expect(JSON.parse(JSON.stringify(spec))).toStrictEqual(spec);
  expect(schemaErrors(spec)).toEqual([]);
  const { warnings } = await compileVegaLite(spec);
  expect(warnings).toEqual([]);
}

/** Deep-freezes arrays and objects so a test proves a builder does not write into its input. */
export function deepFreeze<T>(value: T): T {
  if (value && typeof value === 'object' && !Object.isFrozen(value)) {
    Object.freeze(value);
    for (const v of Object.values(value as object)) deepFreeze(v);
  }
  return value;
}

/**
 * The spec for its snapshot: each dataset cut to its first 3 rows and its length (the data
 * is checked by the tests); the shared config block checked once, not in every snapshot.
 */
export function forSnapshot(spec: VegaLiteSpec): unknown {
  const datasets = spec.datasets as Record<string, unknown[]>;
  const cut = Object.fromEntries(Object.entries(datasets).map(([k, rows]) => [k, { rows: rows.length, first: rows.slice(0, 3) }]));
  expect(spec.config).toStrictEqual(vegaLiteConfig());
  return { ...spec, datasets: cut, config: '(vegaLiteConfig())' };
}
