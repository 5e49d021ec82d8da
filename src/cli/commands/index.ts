import type { Command } from '../command.js';
import { applyCommand } from './apply.js';
import { calibrateCommand } from './calibrate.js';
import { barycentricCommand } from './barycentric.js';
import { elementsCommand } from './elements.js';
import { findCommand } from './find.js';
import { fitCommand } from './fit.js';
import { infoCommand } from './info.js';
import { orbitCommand } from './orbit.js';
import { periodogramCommand } from './periodogram.js';

/** Every subcommand, in the order --help lists them. Add new commands here. */
export const commands: readonly Command[] = [
  infoCommand,
  barycentricCommand,
  calibrateCommand,
  applyCommand,
  findCommand,
  fitCommand,
  elementsCommand,
  periodogramCommand,
  orbitCommand,
];
