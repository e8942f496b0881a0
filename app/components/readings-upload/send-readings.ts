/** Sends readings in chunks to the organisation's readings endpoint, reporting the tally after each. */
import {
  addChunkAnswer,
  chunksOf,
  emptyTally,
  type ChunkAnswer,
  type UploadTally,
} from "~/ingest/upload-tally";

async function postChunk(
  orgId: string,
  readings: readonly unknown[],
): Promise<ChunkAnswer> {
  const response = await fetch(`/api/v1/orgs/${orgId}/readings`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ readings }),
  });
  const body = await response.json().catch(() => null);
  if (!response.ok)
    throw new Error(
      body?.error?.message ?? `The server answered ${response.status}.`,
    );
  return body as ChunkAnswer;
}

/** Readings to send, each with the file row it came from (readingRows[i] for readings[i]). */
export interface ReadingsToSend {
  readings: readonly unknown[];
  readingRows: readonly number[];
}

export async function sendReadings(
  args: ReadingsToSend & {
    orgId: string;
    onTally: (tally: UploadTally) => void;
  },
): Promise<{ tally: UploadTally; failed?: string }> {
  const { orgId, readings, readingRows, onTally } = args;
  let tally = emptyTally(readings.length);
  onTally(tally);
  for (const chunk of chunksOf(readings)) {
    try {
      const answer = await postChunk(orgId, chunk.items);
      tally = addChunkAnswer(
        tally,
        { offset: chunk.offset, size: chunk.items.length },
        answer,
        (i) => readingRows[i],
      );
      onTally(tally);
    } catch (error) {
      return {
        tally,
        failed: `${(error as Error).message} Readings from row ${readingRows[chunk.offset]} on were not sent; those before were stored. Sending the file again is safe: stored readings count as already stored.`,
      };
    }
  }
  return { tally };
}
