import { describe, expect, it } from 'vitest';
import type { Command } from '../../src/cli/command.js';
import { runCli } from '../../src/cli/run.js';
import { InputError } from '../../src/errors.js';
import { captureIO } from '../helpers/cli.js';
import { repoPath } from '../helpers/paths.js';

const capture = () => captureIO();

const echo: Command = {
  name: 'echo', summary: 'test command', usage: 'X [--n N]', description: '',
  options: [{ name: 'n', type: 'number', description: 'a number' }, { name: 'lamp', type: 'list', description: 'lamps' }, { name: 'flag', type: 'boolean', description: 'a flag' }],
  positionals: { min: 1, max: 1, name: 'X' },
  async run(args, io) {
    if (args.positionals[0] === 'bad') throw new InputError('t.bad', 'it is bad', { file: 'bad', line: 3 });
    if (args.positionals[0] === 'boom') throw new Error('boom');
    io.stdout(JSON.stringify({ p: args.positionals, n: args.options.get('n'), lamp: args.options.get('lamp'), flag: args.options.get('flag') ?? false, json: args.json }));
    return 0;
  },
};

describe('runCli', () => {
  it('parses options, negative numbers and lists', async () => {
    const io = capture();
    expect(await runCli(['echo', 'a', '--n', '-71.5', '--lamp=neon, argon', '--flag', '--json'], io, [echo])).toBe(0);
    expect(JSON.parse(io.out)).toEqual({ p: ['a'], n: -71.5, lamp: ['neon', 'argon'], flag: true, json: true });
  });

  it.each([
    [['echo'], /needs a X argument/],
    [['echo', 'a', 'b'], /takes at most 1 X argument/],
    [['echo', 'a', '--what'], /unknown option --what/],
    [['echo', 'a', '--n', 'abc'], /--n needs a number, got "abc"/],
    [['echo', 'a', '--n'], /--n needs a value/],
    [['nope'], /unknown command "nope"/],
  ])('exits 2 with one line on usage error %j', async (argv, message) => {
    const io = capture();
    expect(await runCli(argv, io, [echo])).toBe(2);
    expect(io.err).toMatch(/^lineshift: /);
    expect(io.err.trim().split('\n')).toHaveLength(1);
    expect(io.err).toMatch(message);
  });

  it('exits 1 with one located line on bad input, and no stack trace on internal errors', async () => {
    let io = capture();
    expect(await runCli(['echo', 'bad'], io, [echo])).toBe(1);
    expect(io.err).toBe('lineshift: bad: line 3: it is bad\n');
    io = capture();
    expect(await runCli(['echo', 'boom'], io, [echo])).toBe(1);
    expect(io.err).toMatch(/^lineshift: internal error: boom/);
    expect(io.err).not.toMatch(/at .*\.ts/);
  });

  it('prints help with exit 0', async () => {
    const io = capture();
    expect(await runCli(['echo', '--help'], io, [echo])).toBe(0);
    expect(io.out).toMatch(/^Usage: lineshift echo X/);
    expect(io.out).toMatch(/--json/);
  });
});

describe('every command reads its files relative to the working folder it is given', () => {
  // runCli with io.cwd = data/samples and bare file names, while the process runs elsewhere
  // (the repository root): a command that read relative to the process would not find them.
  const samples = repoPath('data', 'samples');
  it.each([
    [['info', 'lvac7-star.fits', '--json']],
    [['find', 'lvac7-star.fits', '--json']],
    [['fit', 'lvac7-star.fits', '--center', '6347.1', '--json']],
    [['elements', 'lvac7-star.fits', '--velocity', '-23.4', '--json']],
    [['velocity', 'lvac7-star.fits', '--species', 'H,Si II', '--topocentric', '--json']],
    [['calibrate', 'lamp-ne-ar.fits', '--lamp', 'neon,argon', '--json']],
  ])('%j', async (argv) => {
    expect(process.cwd()).not.toBe(samples);
    const io = captureIO({ cwd: samples });
    const code = await runCli(argv, io);
    expect(io.err, argv.join(' ')).not.toMatch(/no such file/);
    expect(code, io.err).toBe(0);
    expect(() => JSON.parse(io.out)).not.toThrow();
  });
});
