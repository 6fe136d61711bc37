/**
 * PostgreSQL's COPY binary format (PostgreSQL documentation, "COPY", Binary Format): an 11-byte
 * signature `PGCOPY\n\377\r\n\0`, a 32-bit flags field and a 32-bit header-extension length
 * (both 0 here); then per row a 16-bit field count and per field a 32-bit length (−1 for NULL)
 * and the value in its type's binary send form; a 16-bit −1 ends the data. Every integer is in
 * network byte order (big-endian). The send forms used here: int4 and int8 big-endian two's
 * complement, float8 big-endian IEEE 754, bool one byte, text UTF-8, bytea the bytes themselves.
 *
 * `BinaryCopyEncoder` writes rows into chunks of about `chunkBytes` (each chunk a complete COPY
 * input on its own when `framed`, for an engine that takes one file per COPY, or one stream of
 * tuples for a server); a large bytea value is referenced, not copied, so a long curve costs its
 * own size once. `decodeBinaryCopy` reads what `COPY … TO … (FORMAT binary)` writes back into
 * rows of the types asked for (bytea as a view into the input; the caller copies what it keeps).
 *
 * Written by hand: the framing is a few lines, and the registry's binary COPY package turns every
 * field into stream objects and brings six dependencies; here a row costs one small buffer.
 */

export type BinaryType = 'int4' | 'int8' | 'float8' | 'bool' | 'text' | 'bytea';

/** A bytea value: bytes, or the little-endian bytes of a Float64Array (channel-bytes.ts). */
export type BinaryValue = null | undefined | number | boolean | string | Uint8Array;

const SIGNATURE = Buffer.from([0x50, 0x47, 0x43, 0x4f, 0x50, 0x59, 0x0a, 0xff, 0x0d, 0x0a, 0x00]);
/** signature, flags (0), header extension length (0) */
export const BINARY_COPY_HEADER = Buffer.concat([SIGNATURE, Buffer.alloc(8)]);
/** the 16-bit −1 that ends the data */
export const BINARY_COPY_TRAILER = Buffer.from([0xff, 0xff]);

const SMALL = 64 * 1024;

export class BinaryCopyEncoder {
  private parts: Uint8Array[] = [];
  private partsBytes = 0;
  private buf = Buffer.allocUnsafe(SMALL);
  private at = 0;
  private started = false;

  /**
   * @param types the column types, in column order
   * @param framed each chunk is a whole COPY input (header … trailer); else the header opens the
   *   first chunk and `finish()` writes the trailer
   * @param chunkBytes a chunk is ready (`ready()`) once it holds at least this many bytes
   */
  constructor(
    private readonly types: readonly BinaryType[],
    private readonly framed: boolean,
    private readonly chunkBytes = 2 * 1024 * 1024,
  ) {}

  private room(n: number): void {
    if (this.at + n <= this.buf.length) return;
    this.flushSmall();
    if (n > this.buf.length) this.buf = Buffer.allocUnsafe(n);
  }

  private flushSmall(): void {
    if (this.at === 0) return;
    this.parts.push(this.buf.subarray(0, this.at));
    this.partsBytes += this.at;
    this.buf = Buffer.allocUnsafe(SMALL);
    this.at = 0;
  }

  private open(): void {
    if (this.started) return;
    this.started = true;
    this.room(BINARY_COPY_HEADER.length);
    BINARY_COPY_HEADER.copy(this.buf, this.at);
    this.at += BINARY_COPY_HEADER.length;
  }

  /** Bytes held (not yet taken). */
  get size(): number {
    return this.partsBytes + this.at;
  }

  /** Appends one row (values in column order; null or undefined is NULL). */
  row(values: readonly BinaryValue[]): void {
    if (values.length !== this.types.length) throw new Error(`binary COPY: ${values.length} values for ${this.types.length} columns`);
    this.open();
    this.room(2);
    this.buf.writeInt16BE(values.length, this.at);
    this.at += 2;
    for (let i = 0; i < values.length; i++) this.field(this.types[i], values[i]);
  }

  private field(type: BinaryType, v: BinaryValue): void {
    if (v === null || v === undefined) {
      this.room(4);
      this.buf.writeInt32BE(-1, this.at);
      this.at += 4;
      return;
    }
    switch (type) {
      case 'int4':
        this.room(8);
        this.buf.writeInt32BE(4, this.at);
        this.buf.writeInt32BE(v as number, this.at + 4);
        this.at += 8;
        return;
      case 'int8':
        this.room(12);
        this.buf.writeInt32BE(8, this.at);
        this.buf.writeBigInt64BE(BigInt(v as number), this.at + 4);
        this.at += 12;
        return;
      case 'float8':
        this.room(12);
        this.buf.writeInt32BE(8, this.at);
        this.buf.writeDoubleBE(v as number, this.at + 4);
        this.at += 12;
        return;
      case 'bool':
        this.room(5);
        this.buf.writeInt32BE(1, this.at);
        this.buf[this.at + 4] = v ? 1 : 0;
        this.at += 5;
        return;
      case 'text': {
        const s = String(v);
        const n = Buffer.byteLength(s, 'utf8');
        this.room(4 + n);
        this.buf.writeInt32BE(n, this.at);
        this.buf.write(s, this.at + 4, 'utf8');
        this.at += 4 + n;
        return;
      }
      case 'bytea': {
        const b = v as Uint8Array;
        this.room(4);
        this.buf.writeInt32BE(b.byteLength, this.at);
        this.at += 4;
        if (b.byteLength <= 4096) {
          this.room(b.byteLength);
          this.buf.set(b, this.at);
          this.at += b.byteLength;
        } else {
          this.flushSmall();
          this.parts.push(b);
          this.partsBytes += b.byteLength;
        }
        return;
      }
    }
  }

  /** True when a chunk of at least `chunkBytes` is held. */
  ready(): boolean {
    return this.size >= this.chunkBytes;
  }

  /** The bytes held as one chunk (framed: header … trailer); empty when no row was added since the last take. */
  take(): Uint8Array[] {
    if (this.framed) {
      if (!this.started) return [];
      this.room(2);
      BINARY_COPY_TRAILER.copy(this.buf, this.at);
      this.at += 2;
      this.started = false;
    }
    this.flushSmall();
    const out = this.parts;
    this.parts = [];
    this.partsBytes = 0;
    return out;
  }

  /** The last chunk, trailer included (unframed: the end of the stream). */
  finish(): Uint8Array[] {
    if (!this.framed) {
      this.open();
      this.room(2);
      BINARY_COPY_TRAILER.copy(this.buf, this.at);
      this.at += 2;
    }
    return this.take();
  }
}

export type DecodedValue = null | number | boolean | string | Uint8Array;

/**
 * Rows of a binary COPY output (`COPY … TO … (FORMAT binary)`), each field decoded by its type.
 * Throws on a malformed input (a wrong signature, a field count that differs from `types`).
 */
export function decodeBinaryCopy(data: Uint8Array, types: readonly BinaryType[]): DecodedValue[][] {
  const b = Buffer.from(data.buffer, data.byteOffset, data.byteLength);
  if (b.length < BINARY_COPY_HEADER.length || !b.subarray(0, SIGNATURE.length).equals(SIGNATURE)) throw new Error('binary COPY: not a binary COPY output (signature)');
  let at = SIGNATURE.length + 4;
  at += 4 + b.readInt32BE(at);
  const rows: DecodedValue[][] = [];
  for (;;) {
    const count = b.readInt16BE(at);
    at += 2;
    if (count === -1) return rows;
    if (count !== types.length) throw new Error(`binary COPY: a row of ${count} fields, expected ${types.length}`);
    const row: DecodedValue[] = new Array(count);
    for (let i = 0; i < count; i++) {
      const n = b.readInt32BE(at);
      at += 4;
      if (n === -1) {
        row[i] = null;
        continue;
      }
      switch (types[i]) {
        case 'int4':
          row[i] = b.readInt32BE(at);
          break;
        case 'int8':
          row[i] = Number(b.readBigInt64BE(at));
          break;
        case 'float8':
          row[i] = b.readDoubleBE(at);
          break;
        case 'bool':
          row[i] = b[at] !== 0;
          break;
        case 'text':
          row[i] = b.toString('utf8', at, at + n);
          break;
        case 'bytea':
          row[i] = b.subarray(at, at + n);
          break;
      }
      at += n;
    }
    rows.push(row);
  }
}
