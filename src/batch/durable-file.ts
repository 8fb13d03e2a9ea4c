import { closeSync, fdatasync, fdatasyncSync, fsyncSync, openSync, renameSync, unlinkSync, writeSync } from "node:fs";
import { dirname } from "node:path";

/**
 * Writes all of a string to an open file, synchronously (one or more write calls until every byte is
 * written). Once this returns the bytes belong to the kernel: killing the process cannot lose them.
 */
export function writeFully(fd: number, text: string): void {
  const bytes = Buffer.from(text, "utf8");
  let written = 0;
  while (written < bytes.length) written += writeSync(fd, bytes, written, bytes.length - written);
}

/**
 * A file appended to line by line and flushed to the storage device (fdatasync) in the background:
 * each {@link append} writes at once, and a flush starts whenever none is running, so appends made
 * during a flush are covered by the next one (group commit). The process never waits for the disk
 * while appending, yet every row is on storage within about one flush of being written. A killed
 * process loses nothing it appended (the kernel has it); a machine that loses power loses at most the
 * rows of the last fraction of a second.
 */
export class DurableAppender {
  private fd: number | undefined;
  private written = 0;
  private synced = 0;
  private flushing: Promise<void> | undefined;
  private failure: Error | undefined;

  /** Opens `path` for appending (creating it), or truncates it first with `truncate`. */
  constructor(
    readonly path: string,
    truncate = false,
  ) {
    this.fd = openSync(path, truncate ? "w" : "a");
  }

  /** Appends text; throws if an earlier background flush failed (for example a full disk). */
  append(text: string): void {
    if (this.fd === undefined) throw new Error(`${this.path} is closed`);
    if (this.failure) throw this.failure;
    writeFully(this.fd, text);
    this.written += 1;
    if (!this.flushing) this.flushing = this.flushInBackground();
  }

  private async flushInBackground(): Promise<void> {
    while (this.synced < this.written && this.fd !== undefined) {
      const target = this.written;
      try {
        await new Promise<void>((resolve, reject) => fdatasync(this.fd!, (error) => (error ? reject(error) : resolve())));
      } catch (error) {
        this.failure = new Error(`cannot flush ${this.path} to storage: ${(error as Error).message}`);
        break;
      }
      this.synced = target;
    }
    this.flushing = undefined;
  }

  /** Flushes everything appended so far to storage and closes the file. */
  async close(): Promise<void> {
    if (this.fd === undefined) return;
    await this.flushing;
    fdatasyncSync(this.fd);
    closeSync(this.fd);
    this.fd = undefined;
    if (this.failure) throw this.failure;
  }
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
