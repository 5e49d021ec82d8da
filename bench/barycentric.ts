/**
 * Barycentric corrections per second: full `barycentricCorrection` calls (time scales,
 * astronomy-engine ephemerides for the Earth, Sun, Jupiter and Moon, Earth rotation,
 * relativistic correction, light times) on seeded random times, targets and sites.
 *
 *   npx tsx bench/barycentric.ts
 */
import { barycentricCorrection, type BarycentricInput } from '../src/velocity/barycentric.js';
import { readObservation } from '../src/velocity/observation.js';
import { makeSite } from '../src/velocity/site.js';
import { utcFromMjd } from '../src/velocity/time.js';
import { Header } from '../src/spectrum/header.js';

let seed = 12345;
const random = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);

const inputs: BarycentricInput[] = Array.from({ length: 2000 }, () => ({
  time: utcFromMjd(47892 + random() * 16800),
  target: { raDeg: random() * 360, decDeg: (Math.asin(2 * random() - 1) * 180) / Math.PI },
  site: makeSite((Math.asin(2 * random() - 1) * 180) / Math.PI, random() * 360 - 180, random() * 3000),
}));

function rate(label: string, fn: (i: number) => number, n: number): void {
  let sink = 0;
  for (let i = 0; i < Math.min(n, 200); i++) sink += fn(i); // warm-up
  const t0 = performance.now();
  for (let i = 0; i < n; i++) sink += fn(i);
  const ms = performance.now() - t0;
  console.log(`${label.padEnd(44)} ${(n / (ms / 1000)).toFixed(0).padStart(8)} per second  (${((ms * 1000) / n).toFixed(1)} µs each; checksum ${sink.toFixed(3)})`);
}

rate('barycentricCorrection', (i) => barycentricCorrection(inputs[i % inputs.length]).barycentricCorrectionKmPerS, 4000);

const header = Header.from([
  { keyword: 'DATE-OBS', value: '2024-03-05T21:14:07.000' }, { keyword: 'EXPTIME', value: 600 },
  { keyword: 'OBJCTRA', value: '06 45 09.0' }, { keyword: 'OBJCTDEC', value: '-16 42 58' },
  { keyword: 'SITELAT', value: '+38:52:10' }, { keyword: 'SITELONG', value: '-121:03:40' }, { keyword: 'SITEELEV', value: 312 },
]);
rate('readObservation (header → inputs)', () => readObservation(header).target.raDeg, 20000);
console.log(`node ${process.version}, ${process.platform} ${process.arch}`);
