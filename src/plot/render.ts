/**
 * Rendering of Vega-Lite specs to SVG text in Node, with vega and vega-lite.
 *
 * vega 6 and vega-lite 6 are ES modules with top-level await. The notebook kernel loads
 * this library with `require`, which cannot load a module graph that has top-level await
 * (ERR_REQUIRE_ASYNC_MODULE). So they are imported lazily, with `await import(...)`
 * inside the functions below, and never with a static import anywhere in the library.
 */
import { UsageError } from '../errors.js';
import { silentLogger, type Logger } from '../logger.js';
import type { VegaLiteSpec } from './spec.js';
import { installTextMeasure } from './textWidth.js';

/** Options of {@link renderSvg} and {@link compileVegaLite}. */
export interface RenderOptions {
  /** Receives the warnings of vega-lite's compiler and of vega's runtime (code `plot.vega-warning`). Default: silent. */
  logger?: Logger;
  /**
   * Prefix for the `id` attributes in the SVG (clip paths, gradients), so that several
   * plots inlined in one HTML page do not share ids. Default: `ls` and a hash of the SVG
   * text, so the output does not depend on what was rendered before.
   */
  idPrefix?: string;
}

/** The result of {@link compileVegaLite}. */
export interface CompiledPlot {
  /** The Vega spec that vega-lite produced. */
  readonly vegaSpec: Record<string, unknown>;
  /** Warnings and errors vega-lite logged while compiling, as text, in order. */
  readonly warnings: readonly string[];
}

/** The part of vega-util's logger interface that vega and vega-lite call. */
interface VegaLoggerLike {
  level(): number;
  level(level: number): VegaLoggerLike;
  error(...args: readonly unknown[]): VegaLoggerLike;
  warn(...args: readonly unknown[]): VegaLoggerLike;
  info(...args: readonly unknown[]): VegaLoggerLike;
  debug(...args: readonly unknown[]): VegaLoggerLike;
}

/** A vega/vega-lite logger that hands every warning and error to `sink` as one line of text. */
function capturingLogger(sink: (message: string) => void): VegaLoggerLike {
  let current = 2; // vega's Warn level: errors and warnings only.
  const text = (args: readonly unknown[]) => args.map((a) => (a instanceof Error ? a.message : String(a))).join(' ');
  const self: VegaLoggerLike = {
    level(level?: number): never {
      if (level === undefined) return current as never;
      current = level;
      return self as never;
    },
    error(...args) { sink(text(args)); return self; },
    warn(...args) { sink(text(args)); return self; },
    info() { return self; },
    debug() { return self; },
  } as VegaLoggerLike;
  return self;
}

/**
 * Compiles a Vega-Lite spec to a Vega spec with vega-lite, collecting its warnings
 * instead of printing them. Used by the tests to prove that every builder's spec compiles
 * cleanly, and by {@link renderSvg}.
 *
 * @param spec a Vega-Lite spec; not modified.
 * @param options logger that also receives the warnings.
 * @returns the Vega spec and the warnings.
 * @throws {Error} vega-lite's own error for a spec it cannot compile.
 * @example
 * const { warnings } = await compileVegaLite(spectrumPlot({ wavelengthAngstrom: [1, 2], flux: [3, 4] }));
 * warnings.length; // 0
 */
export async function compileVegaLite(spec: VegaLiteSpec, options: RenderOptions = {}): Promise<CompiledPlot> {
  const vl = await import('vega-lite');
  const logger = options.logger ?? silentLogger;
  const warnings: string[] = [];
  const vlLogger = capturingLogger((message) => {
    warnings.push(message);
    logger.warn({ code: 'plot.vega-warning', message: `vega-lite: ${message}` });
  });
  // vega-lite copies what it needs from the spec; a deep copy guards against any in-place normalisation.
  const input = structuredClone(spec) as unknown as Parameters<typeof vl.compile>[0];
  const compiled = vl.compile(input, { logger: vlLogger as unknown as NonNullable<Parameters<typeof vl.compile>[1]>['logger'] });
  return { vegaSpec: compiled.spec as unknown as Record<string, unknown>, warnings };
}

/**
 * Renders a Vega-Lite spec to SVG text in Node (no browser, no canvas): compiles it with
 * vega-lite, runs it in a headless vega View (`renderer: 'none'`) and serialises the
 * scene with `toSVG()`. The first call loads vega (about 0.1 s measured here); later
 * calls take tens of milliseconds for the builders' plots.
 *
 * Text in the SVG (titles, labels) is escaped by vega; ids are prefixed (see
 * {@link RenderOptions.idPrefix}) so that the SVG can be inlined into a page that holds
 * other plots.
 *
 * @param spec a Vega-Lite spec, e.g. from {@link spectrumPlot}; not modified.
 * @param options logger for vega-lite and vega warnings; id prefix.
 * @returns the SVG document as text, starting with `<svg`.
 * @throws {Error} vega-lite's or vega's error for a spec they cannot handle.
 * @example
 * const svg = await renderSvg(spectrumPlot({ wavelengthAngstrom: [6550, 6560], flux: [1, 0.9] }));
 * svg.startsWith('<svg'); // true
 */
export async function renderSvg(spec: VegaLiteSpec, options: RenderOptions = {}): Promise<string> {
  const vega = await import('vega');
  installTextMeasure(vega);
  const logger = options.logger ?? silentLogger;
  const { vegaSpec } = await compileVegaLite(spec, options);
  const viewLogger = capturingLogger((message) => logger.warn({ code: 'plot.vega-warning', message: `vega: ${message}` }));
  const view = new vega.View(vega.parse(vegaSpec as unknown as Parameters<typeof vega.parse>[0]), {
    renderer: 'none',
    logger: viewLogger as unknown as NonNullable<ConstructorParameters<typeof vega.View>[1]>['logger'],
  });
  try {
    // vega numbers clip paths and gradients from a counter shared by every render; restart it so
    // that the same spec always gives the same SVG text (the prefix below keeps plots apart).
    (vega as unknown as { resetSVGDefIds?: () => void }).resetSVGDefIds?.();
    const svg = await view.toSVG();
    return prefixSvgIds(svg, options.idPrefix ?? `ls${hashText(svg)}-`);
  } finally {
    view.finalize();
  }
}

/**
 * Prefixes every `id="…"` in an SVG text and every reference to it (`url(#…)`,
 * `href="#…"`), so that several SVGs can share one HTML page without their clip paths
 * and gradients clashing (vega numbers them `clip1`, `clip2`, … in every plot).
 *
 * @param svg SVG text.
 * @param prefix text put before each id; letters, digits, `-` and `_` only.
 * @returns the SVG with prefixed ids.
 * @throws {UsageError} `plot.bad-id-prefix` for a prefix that is not a valid id start.
 * @example prefixSvgIds('<clipPath id="clip1"/><g clip-path="url(#clip1)"/>', 'a-'); // '<clipPath id="a-clip1"/><g clip-path="url(#a-clip1)"/>'
 */
export function prefixSvgIds(svg: string, prefix: string): string {
  if (!/^[A-Za-z][\w-]*$/.test(prefix)) {
    throw new UsageError('plot.bad-id-prefix', `an SVG id prefix must start with a letter and hold only letters, digits, - and _, got "${prefix}"`, { keyword: 'idPrefix' });
  }
  return svg
    .replace(/\sid="([^"]+)"/g, (_m, id: string) => ` id="${prefix}${id}"`)
    .replace(/url\(#([^)]+)\)/g, (_m, id: string) => `url(#${prefix}${id})`)
    .replace(/(\s(?:xlink:)?href)="#([^"]+)"/g, (_m, attr: string, id: string) => `${attr}="#${prefix}${id}"`);
}

/** FNV-1a hash of a text as 8 hex digits (not cryptographic; for stable ids). */
function hashText(text: string): string {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return (h >>> 0).toString(16).padStart(8, '0');
}
