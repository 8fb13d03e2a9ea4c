import { closeSync, fdatasyncSync, fsyncSync, openSync, renameSync, unlinkSync, writeSync } from "node:fs";
import { dirname } from "node:path";

/**
 * Appends text to an open file and flushes it to the storage device (fdatasync), so that what was
 * appended survives a crash of the process or of the machine.
 */
export function appendDurably(fd: number, text: string): void {
  const bytes = Buffer.from(text, "utf8");
  let written = 0;
  while (written < bytes.length) written += writeSync(fd, bytes, written, bytes.length - written);
  fdatasyncSync(fd);
}

/**
 * Flushes a directory entry to storage, so that a file just created or renamed in it survives a crash
 * (POSIX leaves this to the directory's own fsync). Silently skipped where directories cannot be opened.
 */
export function syncDirectory(path: string): void {
  let fd: number | undefined;
  try {
    fd = openSync(path, "r");
    fsyncSync(fd);
  } catch {
    // Some platforms and file systems do not allow fsync on a directory; the rename itself is still atomic.
  } finally {
    if (fd !== undefined) closeSync(fd);
  }
}

/** A temporary sibling of `path` in the same directory (so a rename onto `path` is atomic). */
export function temporarySibling(path: string): string {
  return `${path}.partial-${process.pid}`;
}

/**
 * Writes a file atomically: `write` fills a temporary sibling, which is then flushed to storage and
 * renamed onto `path`. Readers see either the old file or the complete new one, never a part.
 */
export async function replaceAtomically(path: string, write: (temporaryPath: string) => Promise<void>): Promise<void> {
  const temporary = temporarySibling(path);
  try {
    await write(temporary);
    const fd = openSync(temporary, "r+");
    try {
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
    renameSync(temporary, path);
    syncDirectory(dirname(path));
  } catch (error) {
    try {
      unlinkSync(temporary);
    } catch {
      // nothing to remove
    }
    throw error;
  }
}
