/**
 * The public API of ingest: `ingestManifests` (manifests and curve files into the store, with
 * every bad input recorded as a rejection), the readers of the manifest, column-map and curve
 * formats, and the rejection shapes. The scanner, the cell parsers and the new/duplicate decision
 * are internal.
 */
export { ingestManifests } from './ingest-manifests.ts';
export type { IngestOptions, IngestReducer, IngestSummary, ManifestInput } from './ingest-manifests.ts';
export { defaultCurveWorkers } from './curve-pool.ts';
export { REJECTION_CODES, formatRejection, reject, RejectionError } from './rejection.ts';
export type { Rejection, RejectionCode } from './rejection.ts';
export { parseColumnMap, parseColumnMapText } from './column-map.ts';
export type { ColumnMap, ChannelName, ChannelSpec, MapResult } from './column-map.ts';
export { readCurveFile, MIN_CURVE_POINTS } from './curve-reader.ts';
export type { CurveChannels, CurveReadResult } from './curve-reader.ts';
export { readManifest, scanFile } from './manifest-reader.ts';
export type { ManifestRecord, ManifestItem, SummaryValues } from './manifest-reader.ts';
