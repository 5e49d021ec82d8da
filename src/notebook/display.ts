/**
 * Showing plots and tables in a notebook run by the tslab kernel.
 *
 * tslab is not a dependency of this library: it is the kernel that loads it. The kernel's
 * own modules are found among the modules Node has already loaded, so nothing is
 * imported here and the library works the same outside a notebook.
 */
import { createRequire } from 'node:module';
import { silentLogger, type Logger } from '../logger.js';
import { displayMessages, mimeBundle, type BundleOptions, type Displayable, type MimeBundle } from './bundle.js';

/** Options of {@link display}. */
export interface DisplayOptions extends BundleOptions {
  /** Receives `notebook.no-kernel` when no notebook kernel is found, and vega warnings. Default: silent. */
  logger?: Logger;
  /** Sends each display message's bundle instead of the kernel (for tests, or another front end). */
  send?: (bundle: MimeBundle) => void;
}

/** How a bundle reaches the notebook. */
export interface KernelChannel {
  /**
   * `bundle`: one display message holding every MIME type of the bundle (tslab's own
   * display writer). `single`: tslab's public `display.raw(type, value)`, which sends one
   * MIME type per message, so only the best one for every viewer is sent (SVG for a
   * plot, HTML for a table, text otherwise).
   */
  readonly kind: 'bundle' | 'single';
  send(bundle: MimeBundle): void;
}

type LoadedModule = { exports?: Record<string, unknown> } | undefined;

/** Modules Node has loaded with require(), by file path (the kernel's tslab is among them in a notebook). */
function loadedModules(): [string, LoadedModule][] {
  const cache = createRequire(import.meta.url).cache as Record<string, LoadedModule>;
  return Object.entries(cache);
}

/**
 * The tslab kernel's display channel, or undefined outside a notebook.
 *
 * Method: tslab 1.0.22 keeps the writer of the running cell's display messages in
 * `lastWriteDisplayData` of its `dist/jupyter.js` module, which takes a whole
 * `{ data, metadata, transient }` message; its public `display.raw(type, value)` wraps
 * it with a single MIME type. The first is used when present, the second otherwise.
 *
 * @returns the channel, or undefined when no tslab kernel module is loaded.
 * @example kernelChannel(); // undefined outside a notebook
 */
export function kernelChannel(): KernelChannel | undefined {
  const modules = loadedModules();
  for (const [path, mod] of modules) {
    if (!/[\\/]tslab[\\/]dist[\\/]jupyter\.js$/.test(path)) continue;
    const exports = mod?.exports;
    if (exports && 'lastWriteDisplayData' in exports) {
      return {
        kind: 'bundle',
        send(bundle) {
          const write = exports.lastWriteDisplayData;
          if (typeof write !== 'function') throw new Error('the notebook kernel is not running a cell');
          write({ data: bundle, metadata: {}, transient: {} }, false);
        },
      };
    }
  }
  for (const [path, mod] of modules) {
    if (!/[\\/]tslab[\\/]dist[\\/]public\.js$/.test(path)) continue;
    const show = (mod?.exports?.display as { raw?: unknown } | undefined)?.raw;
    if (typeof show === 'function') {
      const raw = show.bind(mod?.exports?.display) as (type: string, value: string) => void;
      return {
        kind: 'single',
        send(bundle) {
          if (bundle['image/svg+xml'] !== undefined) raw('image/svg+xml', bundle['image/svg+xml']);
          else if (bundle['text/html'] !== undefined) raw('text/html', bundle['text/html']);
          else raw('text/plain', bundle['text/plain']);
        },
      };
    }
  }
  return undefined;
}

/**
 * Shows a plot, a table, a text or a library result in the notebook: builds its
 * {@link mimeBundle} (a plot gets its Vega-Lite spec, an SVG rendered in Node and a text
 * line; a table gets escaped HTML and aligned text; a result gets its summary and tables
 * as HTML and text, and its plot) and sends it to the tslab kernel, so JupyterLab shows
 * the live plot and other viewers the SVG. A result with a plot is sent as two display
 * messages, the tables then the plot ({@link displayMessages}): a front end shows only
 * one representation per message. Outside a notebook it sends nothing and tells the
 * logger (`notebook.no-kernel`).
 *
 * Await it (`await display(spec)`), so that the output lands in the cell that made it.
 * It returns nothing, so the cell does not also print the bundle as its value.
 *
 * @param value a Vega-Lite spec, a {@link Table}, a string, or a library result (a
 *   spectrum, line fit, found lines, continuum, identification, dispersion solution,
 *   velocity from lines or by cross-correlation, velocity table, periodogram or orbit fit).
 * @param options the spectrum or velocity table a result came from (for its plot and
 *   titles: `{ spectrum }` for found lines, a continuum or an identification, `{ table }`
 *   for an orbit fit), logger, SVG id prefix, or a `send` function replacing the kernel.
 * @throws {UsageError} `notebook.not-displayable` for anything else.
 * @example await display(spectrumPlot(spectrumPlotData(spectrum)));
 * @example await display(fitLine(star, { centerAngstrom: 6563 }), { spectrum: star });
 */
export async function display(value: Displayable, options: DisplayOptions = {}): Promise<void> {
  const messages = displayMessages(await mimeBundle(value, options));
  if (options.send) {
    for (const m of messages) options.send(m);
    return;
  }
  const channel = kernelChannel();
  if (!channel) {
    (options.logger ?? silentLogger).warn({ code: 'notebook.no-kernel', message: 'display(): no notebook kernel is running, nothing was shown (use mimeBundle() or renderSvg() outside a notebook)' });
    return;
  }
  for (const m of messages) channel.send(m);
}
