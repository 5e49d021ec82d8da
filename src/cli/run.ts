import { InputError, LineshiftError, UsageError } from '../errors.js';
import { lineLogger } from '../logger.js';
import { VERSION } from '../version.js';
import { commandHelp, parseArgs } from './args.js';
import type { Command, CommandIO } from './command.js';
import { commands } from './commands/index.js';

/** Exit codes of the command-line tool. */
export const EXIT_OK = 0;
/** Bad input: a file or value that cannot be used. */
export const EXIT_BAD_INPUT = 1;
/** Usage error: unknown command or option, missing argument. */
export const EXIT_USAGE = 2;

function toolHelp(list: readonly Command[]): string {
  const width = Math.max(...list.map((c) => c.name.length));
  return [
    'Usage: lineshift COMMAND [ARGS] [--json] [--help]',
    '',
    'Wavelength calibration, line fitting, radial velocities and orbits from 1-D spectra.',
    '',
    'Commands:',
    ...list.map((c) => `  ${c.name.padEnd(width)}  ${c.summary}`),
    '',
    'Run "lineshift COMMAND --help" for the options of one command.',
    '',
  ].join('\n');
}

/** Standard IO bound to this process. */
export function processIO(): CommandIO {
  const stderr = (t: string) => void process.stderr.write(t);
  return {
    stdout: (t) => void process.stdout.write(t),
    stderr,
    isTTY: Boolean(process.stderr.isTTY),
    cwd: process.cwd(),
    logger: lineLogger((line) => stderr(line + '\n')),
  };
}

/**
 * Runs the command-line tool on `argv` (the arguments after `lineshift`) and returns the
 * exit code: 0 on success, 1 on bad input (one line starting `lineshift:` on stderr),
 * 2 on a usage error. Never throws and never prints a stack trace (unless the
 * environment variable LINESHIFT_DEBUG is set, for an unexpected internal error).
 */
export async function runCli(argv: readonly string[], io: CommandIO = processIO(), list: readonly Command[] = commands): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === '--help' || name === 'help') {
    io.stdout(toolHelp(list));
    return name === undefined ? EXIT_USAGE : EXIT_OK;
  }
  if (name === '--version') {
    io.stdout(`lineshift ${VERSION}\n`);
    return EXIT_OK;
  }
  const command = list.find((c) => c.name === name);
  if (!command) {
    io.stderr(`lineshift: unknown command "${name}" (commands: ${list.map((c) => c.name).join(', ')})\n`);
    return EXIT_USAGE;
  }
  try {
    const parsed = parseArgs(command, rest);
    if (parsed.help) {
      io.stdout(commandHelp(command));
      return EXIT_OK;
    }
    return await command.run(parsed, io);
  } catch (e) {
    return reportError(e, io);
  }
}

/** Prints one line for an error and returns the exit code it deserves. */
export function reportError(e: unknown, io: CommandIO): number {
  if (e instanceof UsageError) {
    io.stderr(`lineshift: ${oneLine(e.message)}\n`);
    return EXIT_USAGE;
  }
  if (e instanceof InputError || e instanceof LineshiftError) {
    io.stderr(`lineshift: ${oneLine(e.message)}\n`);
    return EXIT_BAD_INPUT;
  }
  const err = e as NodeJS.ErrnoException;
  if (err && typeof err === 'object' && typeof err.code === 'string' && typeof err.path === 'string') {
    const what = err.code === 'ENOENT' ? 'no such file' : err.code === 'EACCES' ? 'permission denied' : err.code === 'EISDIR' ? 'is a directory, not a file' : err.code;
    io.stderr(`lineshift: ${err.path}: ${what}\n`);
    return EXIT_BAD_INPUT;
  }
  io.stderr(`lineshift: internal error: ${oneLine(String((e as Error)?.message ?? e))} (please report this; set LINESHIFT_DEBUG=1 for details)\n`);
  if (process.env.LINESHIFT_DEBUG) io.stderr(String((e as Error)?.stack ?? e) + '\n');
  return EXIT_BAD_INPUT;
}

function oneLine(s: string): string {
  return s.replace(/\s*\n\s*/g, ' ').trim();
}
