import type { Logger } from '../logger.js';

/** How a command talks to the outside world (replaceable in tests). */
export interface CommandIO {
  /** Writes to standard output (results). */
  stdout(text: string): void;
  /** Writes to standard error (messages, warnings, progress). */
  stderr(text: string): void;
  /** True when stderr is a terminal (progress bars only then). */
  readonly isTTY: boolean;
  /** Working directory against which relative paths are resolved. */
  readonly cwd: string;
  /** Logger that prints warnings to stderr. */
  readonly logger: Logger;
}

/** One command-line option. Names are long, lower-case, hyphenated. */
export interface OptionSpec {
  /** Long name without the dashes, e.g. `window`. */
  readonly name: string;
  /** `string`, `number` (parsed and checked finite), `boolean` (a flag), or `list` (comma-separated strings). */
  readonly type: 'string' | 'number' | 'boolean' | 'list';
  /** One line for --help. */
  readonly description: string;
  /** Placeholder shown in --help, e.g. `Å` or `FILE`. */
  readonly valueName?: string;
  /** True when the option must be given. */
  readonly required?: boolean;
}

/** Parsed command line of one subcommand. */
export interface ParsedArgs {
  /** Positional arguments in order. */
  readonly positionals: readonly string[];
  /** Option values by long name; absent options are undefined. */
  readonly options: ReadonlyMap<string, string | number | boolean | string[]>;
  /** True when --json was given. */
  readonly json: boolean;
}

/** A subcommand of the `lineshift` tool: a thin shell over library calls. */
export interface Command {
  /** Subcommand name: a plain English word of our own. */
  readonly name: string;
  /** One line saying what it does. */
  readonly summary: string;
  /** Usage line after `lineshift NAME`, e.g. `FILE... [--json]`. */
  readonly usage: string;
  /** Longer description for --help (what goes in, what comes out, units). */
  readonly description: string;
  /** Options besides --help and --json. */
  readonly options: readonly OptionSpec[];
  /** Allowed number of positional arguments. */
  readonly positionals: { readonly min: number; readonly max: number; readonly name: string };
  /** Runs the command; returns the exit code (0 success). Throws InputError/UsageError for bad input/usage. */
  run(args: ParsedArgs, io: CommandIO): Promise<number>;
}

/** Reads an option known to be a number, or undefined. */
export function numberOption(args: ParsedArgs, name: string): number | undefined {
  const v = args.options.get(name);
  return typeof v === 'number' ? v : undefined;
}

/** Reads an option known to be a string, or undefined. */
export function stringOption(args: ParsedArgs, name: string): string | undefined {
  const v = args.options.get(name);
  return typeof v === 'string' ? v : undefined;
}

/** Reads a list option (comma-separated), or undefined. */
export function listOption(args: ParsedArgs, name: string): string[] | undefined {
  const v = args.options.get(name);
  return Array.isArray(v) ? v : undefined;
}

/** Reads a boolean flag (false when absent). */
export function flagOption(args: ParsedArgs, name: string): boolean {
  return args.options.get(name) === true;
}
