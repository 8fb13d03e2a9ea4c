import { createReadStream } from "node:fs";

/** One line of a file with its byte range, for files that must be cut back to their last whole line. */
export interface FileLine {
  /** The line's text without its line break, decoded as UTF-8. */
  readonly text: string;
  /** 1-based line number. */
  readonly number: number;
  /** Byte offset of the first byte of the line. */
  readonly start: number;
  /** Byte offset just after the line break (or after the last byte when the line has none). */
  readonly end: number;
  /** Whether the line ends with "\n"; only the last line of a file can lack it. */
  readonly terminated: boolean;
}

/**
 * Streams the lines of a file with their byte offsets, holding one line at a time in memory. Offsets
 * are counted in bytes, so they can be handed to `truncate` to cut off a torn last line.
 */
export async function* fileLines(path: string): AsyncGenerator<FileLine> {
  let pending: Buffer[] = [];
  let pendingBytes = 0;
  let offset = 0;
  let number = 0;
  for await (const chunk of createReadStream(path) as AsyncIterable<Buffer>) {
    let from = 0;
    for (let newline = chunk.indexOf(10, from); newline !== -1; newline = chunk.indexOf(10, from)) {
      const piece = chunk.subarray(from, newline);
      const bytes = pending.length ? Buffer.concat([...pending, piece]) : piece;
      const start = offset;
      offset += bytes.length + 1;
      number += 1;
      yield { text: bytes.toString("utf8"), number, start, end: offset, terminated: true };
      pending = [];
      pendingBytes = 0;
      from = newline + 1;
    }
    if (from < chunk.length) {
      pending.push(Buffer.from(chunk.subarray(from)));
      pendingBytes += chunk.length - from;
    }
  }
  if (pendingBytes > 0) {
    const bytes = Buffer.concat(pending);
    number += 1;
    yield { text: bytes.toString("utf8"), number, start: offset, end: offset + bytes.length, terminated: false };
  }
}
