import type { Command } from '../command.js';
import { barycentricCommand } from './barycentric.js';
import { infoCommand } from './info.js';
import { velocityCommand } from './velocity.js';

/** Every subcommand, in the order --help lists them. Add new commands here. */
export const commands: readonly Command[] = [
  infoCommand,
  barycentricCommand,
  velocityCommand,
];
