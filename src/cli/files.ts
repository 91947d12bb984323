/**
 * Reading the files the CLI is given (Node only): a design, a readings file, an op-amp list or a kit.
 */
import { closeSync, constants, fstatSync, openSync, readSync, statSync } from 'node:fs';
import { decodeDesignBytes, MAX_DESIGN_BYTES, tooLargeMessage } from '../model/design.js';

/**
 * Reads a design (or readings) file: only a regular file, and at most the limit plus one byte whatever its stated size
 * (a device or a FIFO states 0). Opened without blocking, so that a FIFO named like a design cannot hang
 * the run; decoded as UTF-8 or UTF-16 the way the app decodes a file.
 */
export function readDesign(path: string, limit = MAX_DESIGN_BYTES, what = 'a design file is a few kB'): { ok: true; text: string } | { ok: false; message: string } {
  let fd = -1;
  try {
    const first = statSync(path);
    if (!first.isFile()) return { ok: false, message: first.isDirectory() ? 'is a folder' : 'is not a regular file' };
    fd = openSync(path, constants.O_RDONLY | (constants.O_NONBLOCK ?? 0));
    const st = fstatSync(fd);
    if (!st.isFile()) return { ok: false, message: 'is not a regular file' };
    if (st.size > limit) return { ok: false, message: tooLargeMessage(limit, what) };
    const buf = Buffer.alloc(limit + 1);
    let n = 0;
    for (let got = 1; got > 0 && n < buf.length; n += got) got = readSync(fd, buf, n, buf.length - n, null);
    if (n > limit) return { ok: false, message: tooLargeMessage(limit, what) };
    const text = decodeDesignBytes(buf.subarray(0, n));
    if (!text.ok) return { ok: false, message: text.problems[0]!.message };
    return { ok: true, text: text.text };
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    return { ok: false, message: code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'is a folder' : `cannot be read (${code ?? 'error'})` };
  } finally {
    if (fd >= 0) closeSync(fd);
  }
}


/** An error (or any value) as one short line for a message: its text, whitespace folded, at most 300 characters. */
export const oneLine = (e: unknown) => String(e instanceof Error ? e.message : e).replace(/\s+/g, ' ').slice(0, 300);
