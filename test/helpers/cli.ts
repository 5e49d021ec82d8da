import type { CommandIO } from '../../src/cli/command.js';
import { collectingLogger } from '../../src/logger.js';

/** A CommandIO that keeps stdout, stderr and warnings, for running commands in-process with `runCli`. */
export type CapturedIO = CommandIO & { out: string; err: string; warnings: ReturnType<typeof collectingLogger> };

/**
 * Captures a command's output. `cwd` defaults to the process's working folder; `isTTY`
 * pretends stderr is a terminal (progress bars).
 */
export function captureIO(options: { cwd?: string; isTTY?: boolean } = {}): CapturedIO {
  const warnings = collectingLogger();
  const io: CapturedIO = {
    out: '',
    err: '',
    isTTY: options.isTTY ?? false,
    cwd: options.cwd ?? process.cwd(),
    logger: warnings,
    warnings,
    stdout(t: string) { io.out += t; },
    stderr(t: string) { io.err += t; },
  };
  return io;
}
