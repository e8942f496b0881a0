/**
 * What the upload page counts while it sends a file in chunks to
 * POST /api/v1/orgs/:orgId/readings: each chunk's answer added to the totals,
 * its refusals tied back to the file's rows. Pure, so the page and its tests
 * share it.
 */

/** Readings per request: well under the API's 5,000, so progress moves often and one refusal costs little. */
export const UPLOAD_CHUNK = 2500;

export interface ChunkAnswer {
  accepted: number;
  repeats: number;
  rejected: { index: number; meter?: string; reason: string }[];
  conflicts: { index: number; meter?: string; reason: string }[];
}

export interface Refusal {
  row: number;
  meter?: string;
  reason: string;
}

export interface UploadTally {
  total: number;
  sent: number;
  accepted: number;
  /** Readings the organisation already holds: a repeated upload changes nothing. */
  alreadyStored: number;
  refused: Refusal[];
}

export function emptyTally(total: number): UploadTally {
  return { total, sent: 0, accepted: 0, alreadyStored: 0, refused: [] };
}

/** The chunks of a list of readings, with the offset of each. */
export function* chunksOf<T>(
  items: readonly T[],
  size: number = UPLOAD_CHUNK,
): Generator<{ offset: number; items: T[] }> {
  for (let offset = 0; offset < items.length; offset += size) {
    yield { offset, items: items.slice(offset, offset + size) };
  }
}

/**
 * The tally after one chunk's answer. `rowOf(i)` is the file row of the
 * i-th reading of the whole upload; the answer's indexes count from the chunk's start.
 */
export function addChunkAnswer(
  tally: UploadTally,
  chunk: { offset: number; size: number },
  answer: ChunkAnswer,
  rowOf: (index: number) => number,
): UploadTally {
  const refused = [...answer.rejected, ...answer.conflicts].map((p) => ({
    row: rowOf(chunk.offset + p.index),
    meter: p.meter,
    reason: p.reason,
  }));
  return {
    total: tally.total,
    sent: Math.min(tally.total, chunk.offset + chunk.size),
    accepted: tally.accepted + answer.accepted,
    alreadyStored: tally.alreadyStored + answer.repeats,
    refused: [...tally.refused, ...refused].sort((a, b) => a.row - b.row),
  };
}
