import { UsageError } from '../errors.js';
import type { Command, OptionSpec, ParsedArgs } from './command.js';

/**
 * Parses the arguments after the subcommand name. Accepts `--name value`, `--name=value`
 * and, for flags, `--name`. A lone `--` ends options. Negative numbers are accepted as
 * option values (`--lon -71.1`).
 *
 * @throws {UsageError} for unknown options, missing values, values that are not numbers,
 *   missing required options and a wrong count of positional arguments.
 */
export function parseArgs(command: Command, argv: readonly string[]): ParsedArgs & { help: boolean } {
  const specs = new Map<string, OptionSpec>();
  for (const o of command.options) specs.set(o.name, o);
  const options = new Map<string, string | number | boolean | string[]>();
  const positionals: string[] = [];
  let json = false;
  let help = false;
  let onlyPositionals = false;
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (onlyPositionals || !arg.startsWith('--') || arg === '-') {
      if (!onlyPositionals && arg.startsWith('-') && arg.length > 1 && !/^-\d/.test(arg)) {
        throw new UsageError('cli.short-option', `unknown option ${arg} (options are long, e.g. --help)`);
      }
      positionals.push(arg);
      continue;
    }
    if (arg === '--') {
      onlyPositionals = true;
      continue;
    }
    const eq = arg.indexOf('=');
    const name = arg.slice(2, eq < 0 ? undefined : eq);
    let inline = eq < 0 ? undefined : arg.slice(eq + 1);
    if (name === 'help') { help = true; continue; }
    if (name === 'json') { json = true; continue; }
    const spec = specs.get(name);
    if (!spec) {
      throw new UsageError('cli.unknown-option', `unknown option --${name} for "lineshift ${command.name}" (see lineshift ${command.name} --help)`);
    }
    if (spec.type === 'boolean') {
      if (inline !== undefined) throw new UsageError('cli.flag-value', `option --${name} takes no value`);
      options.set(name, true);
      continue;
    }
    if (inline === undefined) {
      if (i + 1 >= argv.length) throw new UsageError('cli.missing-value', `option --${name} needs a value${spec.valueName ? ` (${spec.valueName})` : ''}`);
      inline = argv[++i];
    }
    if (spec.type === 'number') {
      const v = Number(inline);
      if (inline.trim() === '' || !Number.isFinite(v)) throw new UsageError('cli.not-a-number', `option --${name} needs a number, got "${inline}"`);
      options.set(name, v);
    } else if (spec.type === 'list') {
      const items = inline.split(',').map((s) => s.trim()).filter((s) => s.length > 0);
      if (items.length === 0) throw new UsageError('cli.empty-list', `option --${name} needs at least one value`);
      options.set(name, items);
    } else {
      options.set(name, inline);
    }
  }
  if (!help) {
    for (const spec of command.options) {
      if (spec.required && !options.has(spec.name)) {
        throw new UsageError('cli.missing-option', `"lineshift ${command.name}" needs --${spec.name}${spec.valueName ? ` ${spec.valueName}` : ''}`);
      }
    }
    const { min, max, name } = command.positionals;
    if (positionals.length < min) {
      throw new UsageError('cli.missing-argument', `"lineshift ${command.name}" needs ${min === 1 ? 'a' : `at least ${min}`} ${name} argument${min === 1 ? '' : 's'}`);
    }
    if (positionals.length > max) {
      throw new UsageError('cli.extra-argument', `"lineshift ${command.name}" takes at most ${max} ${name} argument${max === 1 ? '' : 's'}, got ${positionals.length}`);
    }
  }
  return { positionals, options, json, help };
}

/** The --help text of a command. */
export function commandHelp(command: Command): string {
  const lines = [`Usage: lineshift ${command.name} ${command.usage}`, '', command.summary, ''];
  if (command.description) lines.push(command.description.trim(), '');
  lines.push('Options:');
  const rows: [string, string][] = command.options.map((o) => [
    `--${o.name}${o.type === 'boolean' ? '' : ` ${o.valueName ?? (o.type === 'number' ? 'NUMBER' : o.type === 'list' ? 'A,B,...' : 'VALUE')}`}`,
    o.description + (o.required ? ' (required)' : ''),
  ]);
  rows.push(['--json', 'print results as JSON on stdout']);
  rows.push(['--help', 'show this help']);
  const width = Math.max(...rows.map((r) => r[0].length));
  for (const [a, b] of rows) lines.push(`  ${a.padEnd(width)}  ${b}`);
  return lines.join('\n') + '\n';
}
