/**
 * Speed and memory of the text reader and writer, and of resampling.
 * Run: npx tsx bench/text-io.ts [ROWS]   (default 200 000 rows)
 */
import { formatTextSpectrum } from '../src/io/text/write.js';
import { parseTextSpectrum } from '../src/io/text/read.js';
import { logLinearGrid } from '../src/spectrum/grid.js';
import { resampleSpectrum } from '../src/spectrum/resample.js';
import { createSpectrum } from '../src/spectrum/spectrum.js';

const rows = Number(process.argv[2] ?? 200_000);
const w = Float64Array.from({ length: rows }, (_, i) => 3500 + i * (7000 / rows));
const f = w.map((x) => 1000 + 100 * Math.sin(x / 3) + Math.random());
const u = f.map((x) => Math.sqrt(x));
const s = createSpectrum({ wavelength: w, flux: f, uncertainty: u, medium: 'air', fluxUnit: 'adu' });

let t = performance.now();
const text = formatTextSpectrum(s);
const tFormat = performance.now() - t;
const bytes = new TextEncoder().encode(text);
global.gc?.();
const heap0 = process.memoryUsage().heapUsed + process.memoryUsage().arrayBuffers;
t = performance.now();
const back = parseTextSpectrum(bytes, 'bench.csv');
const tParse = performance.now() - t;
const heap1 = process.memoryUsage().heapUsed + process.memoryUsage().arrayBuffers;
const mb = bytes.length / 1e6;
console.log(`${rows} rows, ${mb.toFixed(1)} MB of CSV`);
console.log(`format: ${tFormat.toFixed(0)} ms (${(mb / (tFormat / 1000)).toFixed(1)} MB/s)`);
console.log(`parse:  ${tParse.toFixed(0)} ms (${(mb / (tParse / 1000)).toFixed(1)} MB/s); heap growth during parse ≈ ${((heap1 - heap0) / 1e6).toFixed(0)} MB (${((heap1 - heap0) / bytes.length).toFixed(1)}× the file; garbage not yet collected included)`);

const grid = logLinearGrid({ start: 3600, end: 10400, velocityStepKmPerS: 5 });
t = performance.now();
const r = resampleSpectrum(back, grid);
const tRes = performance.now() - t;
console.log(`resample ${rows} → ${r.wavelength.length} pixels (log-linear, 5 km/s): ${tRes.toFixed(0)} ms`);
