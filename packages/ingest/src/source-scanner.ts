/**
 * A pass-through stream for an input file: computes its SHA-256, checks that it is UTF-8 (the
 * first invalid byte's line is kept), counts lines, drops a leading byte-order mark and the
 * first `skipLines` lines, and emits decoded text for the CSV parser. With a comment prefix it
 * also drops comment lines (starting with the prefix) and empty lines, and keeps a map from the
 * emitted line number to the physical one (`physicalLine`), so the parser can run without its own
 * per-record line bookkeeping, which costs more than the parsing (and without the error object
 * it builds for every record whose length differs from a first, empty one).
 *
 * The UTF-8 check is a small hand-written state machine (RFC 3629: no overlongs, no surrogates,
 * nothing above U+10FFFF) because the decoders at hand report that a chunk is bad but not where.
 */
import { createHash } from 'node:crypto';
import type { Hash } from 'node:crypto';
import { Transform } from 'node:stream';
import type { TransformCallback } from 'node:stream';

export class Utf8Checker {
  /** continuation bytes still expected */
  private need = 0;
  /** allowed range of the next continuation byte (narrowed after E0, ED, F0, F4) */
  private lo = 0x80;
  private hi = 0xbf;
  /** 1-based line of the next byte */
  line = 1;
  /** line of the first invalid byte, or 0 */
  badLine = 0;

  /** Scans a chunk; returns false once an invalid sequence has been seen. */
  push(b: Uint8Array): boolean {
    if (this.badLine) return false;
    let { need, lo, hi, line } = this;
    for (let i = 0; i < b.length; i++) {
      const c = b[i];
      if (need > 0) {
        if (c < lo || c > hi) {
          this.badLine = line;
          return false;
        }
        need--;
        lo = 0x80;
        hi = 0xbf;
        continue;
      }
      if (c < 0x80) {
        if (c === 0x0a) line++;
        continue;
      }
      if (c >= 0xc2 && c <= 0xdf) need = 1;
      else if (c >= 0xe0 && c <= 0xef) {
        need = 2;
        if (c === 0xe0) lo = 0xa0;
        else if (c === 0xed) hi = 0x9f;
      } else if (c >= 0xf0 && c <= 0xf4) {
        need = 3;
        if (c === 0xf0) lo = 0x90;
        else if (c === 0xf4) hi = 0x8f;
      } else {
        this.badLine = line;
        return false;
      }
    }
    this.need = need;
    this.lo = lo;
    this.hi = hi;
    this.line = line;
    return true;
  }

  /** At end of input: false if a sequence was cut off. */
  end(): boolean {
    if (this.badLine) return false;
    if (this.need > 0) {
      this.badLine = this.line;
      return false;
    }
    return true;
  }
}

export class NotUtf8Error extends Error {
  readonly code = 'not_utf8';
  constructor(readonly line: number) {
    super(`not UTF-8 text (first invalid byte on line ${line})`);
  }
}

export class SourceScanner extends Transform {
  private readonly hash: Hash = createHash('sha256');
  private readonly utf8 = new Utf8Checker();
  private readonly decoder = new TextDecoder('utf-8');
  private toSkip: number;
  private first = true;
  bytes = 0;
  private digest: string | null = null;

  private atLineStart = true;
  private dropping = false;
  private emitted = 0;
  private physical = 0;
  /** from emitted line `from` on, physical = emitted + offset */
  private readonly breaks: { from: number; offset: number }[] = [{ from: 1, offset: 0 }];

  constructor(
    skipLines = 0,
    private readonly commentPrefix: string | null = null,
  ) {
    super({ readableObjectMode: false, decodeStrings: true, encoding: 'utf8' });
    this.toSkip = skipLines;
  }

  /** Physical 1-based line of the `k`-th emitted line (1-based). */
  physicalLine(k: number): number {
    let lo = 0;
    let hi = this.breaks.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (this.breaks[mid].from <= k) lo = mid;
      else hi = mid - 1;
    }
    return k + this.breaks[lo].offset;
  }

  private dropLine(): void {
    this.physical++;
    const offset = this.physical - this.emitted;
    const last = this.breaks[this.breaks.length - 1];
    if (last.from === this.emitted + 1) last.offset = offset;
    else this.breaks.push({ from: this.emitted + 1, offset });
  }

  private countLines(text: string): number {
    let n = 0;
    for (let i = text.indexOf('\n'); i >= 0; i = text.indexOf('\n', i + 1)) n++;
    return n;
  }

  /** Drops comment and empty lines (keeping the line map), passes the rest. */
  private filterLines(text: string): string {
    const prefix = this.commentPrefix;
    if (!prefix || text.length === 0) return text;
    const clean =
      !this.dropping &&
      !(this.atLineStart && (text.startsWith(prefix) || text[0] === '\n' || text[0] === '\r')) &&
      !text.includes('\n' + prefix) &&
      !text.includes('\n\n') &&
      !text.includes('\n\r');
    if (clean) {
      const n = this.countLines(text);
      this.emitted += n;
      this.physical += n;
      this.atLineStart = text.endsWith('\n');
      return text;
    }
    let out = '';
    let i = 0;
    while (i < text.length) {
      const nl = text.indexOf('\n', i);
      const end = nl < 0 ? text.length : nl + 1;
      if (this.atLineStart && !this.dropping) {
        const first = text[i];
        this.dropping = text.startsWith(prefix, i) || first === '\n' || (first === '\r' && (i + 1 >= text.length || text[i + 1] === '\n'));
      }
      if (!this.dropping) out += text.slice(i, end);
      if (nl < 0) {
        this.atLineStart = false;
        break;
      }
      if (this.dropping) this.dropLine();
      else {
        this.emitted++;
        this.physical++;
      }
      this.dropping = false;
      this.atLineStart = true;
      i = end;
    }
    return out;
  }

  /** SHA-256 (hex) of all bytes, available after the stream ended. */
  get sha256(): string {
    if (this.digest === null) this.digest = this.hash.digest('hex');
    return this.digest;
  }

  /** lines seen so far (a last line without newline counts) */
  get lines(): number {
    return this.utf8.line;
  }

  override _transform(chunk: Buffer, _enc: BufferEncoding, cb: TransformCallback): void {
    this.hash.update(chunk);
    this.bytes += chunk.length;
    if (!this.utf8.push(chunk)) {
      cb(new NotUtf8Error(this.utf8.badLine));
      return;
    }
    let text = this.decoder.decode(chunk, { stream: true });
    if (this.first && text.length > 0) {
      if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
      this.first = false;
    }
    while (this.toSkip > 0 && text.length > 0) {
      const nl = text.indexOf('\n');
      if (nl < 0) {
        text = '';
        break;
      }
      text = text.slice(nl + 1);
      this.toSkip--;
      this.dropLine();
    }
    text = this.filterLines(text);
    if (text.length > 0) this.push(text);
    cb();
  }

  override _flush(cb: TransformCallback): void {
    if (!this.utf8.end()) {
      cb(new NotUtf8Error(this.utf8.badLine));
      return;
    }
    const rest = this.decoder.decode();
    if (rest && this.toSkip === 0) {
      const t = this.filterLines(rest);
      if (t) this.push(t);
    }
    cb();
  }
}
