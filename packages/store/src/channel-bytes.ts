/**
 * A curve channel as it is stored (`curves.*` bytea columns, migration 0040): the IEEE 754
 * binary64 values of the points in order, each in little-endian byte order, 8 bytes a point —
 * the memory of a Float64Array on a little-endian machine, so writing and reading a channel is
 * a copy of bytes and not a conversion. On a big-endian machine the bytes are swapped.
 * `curve_channel(bytea)` (SQL, migration 0040) decodes the same bytes to float8[] for queries by
 * hand.
 *
 * Degenerate input: an empty array gives no bytes and back; a byte length that is not a
 * multiple of 8 is an error.
 */
import { endianness } from 'node:os';

const LITTLE = endianness() === 'LE';

function swap8(bytes: Uint8Array): Uint8Array {
  const out = new Uint8Array(bytes.length);
  for (let i = 0; i < bytes.length; i += 8) for (let k = 0; k < 8; k++) out[i + k] = bytes[i + 7 - k];
  return out;
}

/** The stored bytes of a channel (a view of the array's memory where the machine is little-endian). */
export function channelBytes(values: Float64Array): Uint8Array {
  const view = new Uint8Array(values.buffer, values.byteOffset, values.byteLength);
  return LITTLE ? view : swap8(view);
}

/** A channel from its stored bytes, in an array of its own (aligned, transferable). */
export function channelFromBytes(bytes: Uint8Array): Float64Array {
  if (bytes.byteLength % 8 !== 0) throw new Error(`a stored curve channel of ${bytes.byteLength} bytes is not a whole number of 8-byte values`);
  const out = new Float64Array(bytes.byteLength / 8);
  new Uint8Array(out.buffer).set(LITTLE ? bytes : swap8(bytes));
  return out;
}
