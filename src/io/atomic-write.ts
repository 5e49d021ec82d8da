import { closeSync, fsyncSync, openSync, renameSync, unlinkSync, writeSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';

/**
 * Writes a whole file so that no reader ever sees half of it: the bytes go to a new
 * temporary file in the same folder (created exclusively, flushed to disk), which is then
 * renamed over `path` — a rename within one file system is atomic (POSIX rename(2)). On any
 * failure the temporary file is removed and the error is rethrown; `path` is then
 * untouched. Every writer of the library goes through this function.
 *
 * @param path the file to create or replace.
 * @param data the whole content (a string is written as UTF-8).
 * @throws the file system's error (e.g. ENOENT for a missing folder, EACCES).
 * @example writeFileAtomic('out/table.csv', 'bjd_tdb,velocity_km_s\n');
 */
export function writeFileAtomic(path: string, data: string | Uint8Array): void {
  const target = resolve(path);
  const bytes = typeof data === 'string' ? Buffer.from(data, 'utf8') : data;
  const temporary = join(dirname(target), `.${basename(target)}.${process.pid}.${Math.random().toString(36).slice(2, 10)}.tmp`);
  let fd: number | undefined;
  try {
    fd = openSync(temporary, 'wx');
    let written = 0;
    while (written < bytes.length) written += writeSync(fd, bytes, written, bytes.length - written);
    fsyncSync(fd);
    closeSync(fd);
    fd = undefined;
    renameSync(temporary, target);
  } catch (e) {
    if (fd !== undefined) closeSync(fd);
    try {
      unlinkSync(temporary);
    } catch {
      // never created, or already renamed
    }
    throw e;
  }
}
