/**
 * Durability of the embedded engine: committed transactions reach the disk before COMMIT returns.
 *
 * PGlite starts PostgreSQL with `-F` (fsync off) by default, and its file layer (Emscripten's
 * NODEFS, which maps the engine's files onto Node's `fs`) has no `fsync` of its own: the engine's
 * `fsync()` returned without doing anything, and `fdatasync()` still does. A killed process loses
 * nothing either way (the operating system keeps what was written), but a power cut or a machine
 * crash can lose transactions that had been reported committed. So:
 *   - the engine starts without `-F` (fsync = on) and with `wal_sync_method = fsync`, so that a
 *     commit flushes the WAL through `fsync()` rather than the inert `fdatasync()`;
 *   - `installFsync` gives the file layer an `fsync` that calls `fs.fsyncSync` on the file (and
 *     on a directory, opened for it), which is what PostgreSQL's own fsync of WAL segments, data
 *     files at checkpoints and directories after renames then reaches.
 * PostgreSQL documentation, "Write-Ahead Logging (WAL)" and "WAL Configuration" (fsync,
 * wal_sync_method). Measured here: ingest of 2,000 tests × 2,000 points on the embedded engine,
 * see the ingest benchmark for the cost.
 *
 * Written against PGlite 0.4's module shape (`Module.FS.filesystems.NODEFS.stream_ops`); if that
 * shape is not found, `installFsync` throws rather than run without the guarantee.
 */
import fs from 'node:fs';
import { PGlite } from '@electric-sql/pglite';

export const PGLITE_DURABLE_PARAMS = [...PGlite.defaultStartParams.filter((p) => p !== '-F'), '-c', 'fsync=on', '-c', 'wal_sync_method=fsync'];

interface NodeFsStream {
  nfd?: number;
  node: { mode: number };
}

interface NodeFsType {
  realPath(node: unknown): string;
  stream_ops: { fsync?: (stream: NodeFsStream) => number };
}

/** Gives the engine's node file layer a real fsync (see above). */
export function installFsync(pglite: PGlite): void {
  const mod = (pglite as unknown as { Module?: { FS?: { filesystems?: { NODEFS?: NodeFsType }; isDir(mode: number): boolean } } }).Module;
  const nodefs = mod?.FS?.filesystems?.NODEFS;
  if (!mod?.FS || !nodefs?.stream_ops) throw new Error('embedded engine: its file layer is not the one this store was written for; cannot make commits durable');
  const FS = mod.FS;
  nodefs.stream_ops.fsync = (stream: NodeFsStream) => {
    if (stream.nfd !== undefined) fs.fsyncSync(stream.nfd);
    else if (FS.isDir(stream.node.mode)) {
      const fd = fs.openSync(nodefs.realPath(stream.node), 'r');
      try {
        fs.fsyncSync(fd);
      } finally {
        fs.closeSync(fd);
      }
    }
    return 0;
  };
}
