import { randomUUID } from "node:crypto";
import { pool } from "~/db/client.server";
import { loadGasContexts } from "~/gas/gas-context.server";
import { withTransaction } from "~/db/transaction.server";
import { findMetersByCode } from "./meter-lookup.server";
import {
  codesIn,
  prepareReadings,
  type Rejection,
} from "./prepare-readings.server";
import { storeReadings } from "./store-readings.server";
import { afterIngest } from "./after-ingest.server";

export interface IngestRequest {
  organizationId: string;
  /** api: a gateway; csv: a person's upload; api_token: an integration's token. */
  source: "api" | "csv" | "api_token" | "seed";
  gatewayId?: string | null;
  userId?: string | null;
  apiTokenId?: string | null;
  readings: readonly unknown[];
  now?: Date;
}

export interface IngestResult {
  batchId: string;
  accepted: number;
  repeats: number;
  rejected: Rejection[];
  conflicts: Rejection[];
}

/**
 * Checks, stores and derives one batch. Nothing is acknowledged before the
 * transaction commits; if it fails, nothing of the batch is stored.
 */
export async function ingestReadings(
  request: IngestRequest,
): Promise<IngestResult> {
  const { organizationId } = request;
  const meters = await findMetersByCode(
    organizationId,
    codesIn(request.readings),
  );
  const { prepared, rejected } = prepareReadings(
    request.readings,
    new Map(meters.map((m) => [m.code, m])),
    request.now,
    await loadGasContexts(organizationId, meters),
  );
  const batchId = randomUUID();
  // Raw SQL on one pg client: the batch write is the hot path that
  // `npm run bench readings` measures against COPY (docs/ingest.md).
  const outcome = await withTransaction(pool, async (client) => {
    const stored = await storeReadings(
      client,
      organizationId,
      batchId,
      prepared,
      {
        source: "late_data",
        reason: `readings received (${request.source})`,
        gatewayId: request.gatewayId ?? null,
        actorUserId: request.userId ?? null,
        actorTokenId: request.apiTokenId ?? null,
      },
    );
    await client.query(
      `insert into ingest_batches (organization_id, id, source, gateway_id, user_id, api_token_id, accepted, repeats, rejected, conflicts)
       values ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10)`,
      [
        organizationId,
        batchId,
        request.source,
        request.gatewayId ?? null,
        request.userId ?? null,
        request.apiTokenId ?? null,
        stored.accepted,
        stored.repeats,
        rejected.length,
        stored.conflicts.length,
      ],
    );
    return stored;
  });
  // Committed: only now is the batch acknowledged and its estimates queued.
  afterIngest(organizationId, outcome.touched);
  return {
    batchId,
    accepted: outcome.accepted,
    repeats: outcome.repeats,
    rejected: rejected.sort((a, b) => a.index - b.index),
    conflicts: outcome.conflicts.sort((a, b) => a.index - b.index),
  };
}
