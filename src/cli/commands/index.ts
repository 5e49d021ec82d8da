import type { Command } from '../command.js';
import { applyCommand } from './apply.js';
import { barycentricCommand } from './barycentric.js';
import { calibrateCommand } from './calibrate.js';
import { elementsCommand } from './elements.js';
import { findCommand } from './find.js';
import { fitCommand } from './fit.js';
import { infoCommand } from './info.js';
import { orbitCommand } from './orbit.js';
import { periodogramCommand } from './periodogram.js';
import { velocityCommand } from './velocity.js';

/** Every subcommand, in the order --help lists them (the order of the work). Add new commands here. */
export const commands: readonly Command[] = [
  infoCommand,
  calibrateCommand,
  applyCommand,
  findCommand,
  fitCommand,
  elementsCommand,
  velocityCommand,
  barycentricCommand,
  periodogramCommand,
  orbitCommand,
];
