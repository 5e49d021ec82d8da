/**
 * Reading a 10^6-pixel float32 FITS spectrum: throughput of readSpectrum (file read +
 * parse + validation) next to a plain fs.readFileSync of the same file, in the same run.
 *
 *     npx tsx bench/fits-read.ts
 */
import { mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseFitsSpectrum } from '../src/io/fits/spectrum.js';
import { writeFitsSpectrum } from '../src/io/fits/write.js';
import { readSpectrum } from '../src/io/read.js';
import { createSpectrum } from '../src/spectrum/spectrum.js';

const PIXELS = 1_000_000;
const REPEATS = 25;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}



function time(f: () => unknown): number {
  const times: number[] = [];
  for (let i = 0; i < REPEATS; i++) {
    const t0 = process.hrtime.bigint();
    f();
    times.push(Number(process.hrtime.bigint() - t0) / 1e6);
  }

  return median(times);
}

const dir = mkdtempSync(join(tmpdir(), 'lineshift-bench-'));
try {
  const path = join(dir, 'big.fits');
  const wavelength = new Float64Array(PIXELS);
  const flux = new Float64Array(PIXELS);
  for (let i = 0; i < PIXELS; i++) {
    wavelength[i] = 3500 + 0.005 * i;
    flux[i] = 1000 + 100 * Math.sin(i / 50);
  }
  writeFitsSpectrum(path, createSpectrum({ wavelength, flux, medium: 'air' }), { dataType: 'float32' });
  const bytes = statSync(path).size;
  const mb = bytes / 1e6;

  // Warm up both paths (page cache, JIT).
  for (let i = 0; i < 5; i++) {
    readFileSync(path);
    readSpectrum(path);
  }
  const plain = time(() => readFileSync(path));
  const ours = time(() => readSpectrum(path));
  const buffer = readFileSync(path);
  const parseOnly = time(() => parseFitsSpectrum(buffer, path));
  // The floor for any reader that returns float64 wavelength and flux arrays: read the file,
  // then fill two fresh Float64Arrays of N values (16 MB of new memory for 4 MB of file).
  const floor = time(() => {
    const b = readFileSync(path);
    const view = new DataView(b.buffer, b.byteOffset + 2880, PIXELS * 4);
    const f = new Float64Array(PIXELS);
    const w = new Float64Array(PIXELS);
    for (let i = 0; i < PIXELS; i++) {
      f[i] = view.getFloat32(4 * i, false);
      w[i] = 3500 + 0.005 * i;
    }
    return [f, w];
  });

  const row = (label: string, ms: number) => `${label.padEnd(44)} ${ms.toFixed(2).padStart(7)} ms ${(mb / (ms / 1000)).toFixed(0).padStart(6)} MB/s`;
  console.log(`FITS read benchmark: ${PIXELS} pixels, float32, ${mb.toFixed(2)} MB, median of ${REPEATS} runs (a shared, busy machine makes single runs noisy), Node ${process.version}`);
  console.log(row('fs.readFileSync (plain read)', plain));
  console.log(row('readSpectrum (read + parse + validate)', ours));
  console.log(row('parseFitsSpectrum (bytes already in memory)', parseOnly));
  console.log(row('floor: read + fill two Float64Arrays', floor));
  console.log(`readSpectrum throughput / plain read throughput: ${(plain / ours).toFixed(2)} (target ≥ 0.5)`);
  console.log(`readSpectrum time / floor time: ${(ours / floor).toFixed(2)}`);
} finally {
  rmSync(dir, { recursive: true, force: true });
}
