/**
 * Line-by-line and token-by-token access to the text formats (OBJ, ASCII PLY, ASCII STL).
 *
 * The bytes are decoded a few megabytes at a time, cut at line ends: a whole 500 MB file
 * decoded at once would exceed what a JavaScript string may hold. Cutting at byte 0x0A is
 * safe in UTF-8, where that byte never occurs inside a multi-byte character.
 */
import { FieldError } from '../errors';

export class TextCursor {
  private readonly decoder = new TextDecoder('utf-8');
  private chunk = '';
  private at = 0;
  private nextByte: number;
  /** 1-based number of the line the last returned line or token came from. */
  lineNumber: number;
  private linesBefore: number;

  /** `firstLine` is the file's line number at byte `start`, for messages. */
  constructor(
    private readonly bytes: Uint8Array,
    start = 0,
    firstLine = 1,
    private readonly chunkBytes = 1 << 23,
  ) {
    this.nextByte = start;
    this.linesBefore = firstLine - 1;
    this.lineNumber = this.linesBefore;
  }

  /** The next line without its line end, or null at the end of the file. */
  nextLine(): string | null {
    if (this.at >= this.chunk.length && !this.loadChunk()) return null;
    let end = this.chunk.indexOf('\n', this.at);
    if (end === -1) end = this.chunk.length;
    let line = this.chunk.slice(this.at, end);
    this.at = end + 1;
    this.lineNumber = ++this.linesBefore;
    if (line.endsWith('\r')) line = line.slice(0, -1);
    return line;
  }

  /** The next whitespace-separated token, or null at the end of the file. */
  nextToken(): string | null {
    for (;;) {
      if (this.at >= this.chunk.length && !this.loadChunk()) return null;
      const s = this.chunk;
      let i = this.at;
      while (i < s.length && s.charCodeAt(i) <= 32) {
        if (s.charCodeAt(i) === 10) this.linesBefore++;
        i++;
      }
      if (i >= s.length) {
        this.at = i;
        continue;
      }
      this.lineNumber = this.linesBefore + 1;
      let j = i;
      while (j < s.length && s.charCodeAt(j) > 32) j++;
      this.at = j;
      return s.slice(i, j);
    }
  }

  /** Skips what is left of the current line, such as a name that may contain anything. */
  skipRestOfLine(): void {
    const end = this.chunk.indexOf('\n', this.at);
    this.at = end === -1 ? this.chunk.length : end;
  }

  private loadChunk(): boolean {
    const bytes = this.bytes;
    if (this.nextByte >= bytes.length) return false;
    let end = Math.min(bytes.length, this.nextByte + this.chunkBytes);
    if (end < bytes.length) {
      const newline = bytes.lastIndexOf(10, end - 1);
      if (newline >= this.nextByte) end = newline + 1;
    }
    this.chunk = this.decoder.decode(bytes.subarray(this.nextByte, end));
    this.nextByte = end;
    this.at = 0;
    return true;
  }
}

const SPECIAL_NUMBER = /^([+-]?)(nan|inf|infinity)$/i;

/**
 * Parses a decimal number as the text formats write it. `nan` and `inf` (as C's printf writes
 * them) are accepted and become NaN and ±Infinity, so the checker can point at the vertex
 * instead of the reader refusing the file. Anything else that is not a number is a FieldError.
 */
export function parseNumber(token: string | null, where: () => string): number {
  if (token !== null && token !== '') {
    const x = Number(token);
    if (!Number.isNaN(x)) return x;
    const special = SPECIAL_NUMBER.exec(token);
    if (special) {
      if (special[2].toLowerCase() === 'nan') return Number.NaN;
      return special[1] === '-' ? -Infinity : Infinity;
    }
  }
  throw new FieldError('malformed-file', token === null ? `The file ends where a number was expected (${where()}).` : `“${clip(token)}” is not a number (${where()}).`);
}

/** Parses a whole number (no fraction, no exponent), or throws a FieldError. */
export function parseInteger(token: string | null, where: () => string): number {
  if (token !== null && /^[+-]?\d+$/.test(token)) {
    const x = Number(token);
    if (Number.isSafeInteger(x)) return x;
  }
  throw new FieldError('malformed-file', token === null ? `The file ends where a whole number was expected (${where()}).` : `“${clip(token)}” is not a whole number (${where()}).`);
}

/** Shortens text quoted from a file so a binary blob cannot flood an error message. */
export function clip(text: string, limit = 40): string {
  const printable = text.replace(/[\u0000-\u001f\u007f-\u009f]/g, '?');
  return printable.length > limit ? `${printable.slice(0, limit)}…` : printable;
}
