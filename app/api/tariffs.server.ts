/**
 * The tariffs API: every member reads an organisation's tariffs; owners and
 * energy managers add tariffs and versions. Bad input answers 400 with the
 * reason and stores nothing (app/tariffs/tariffs.server.ts).
 */
import type { NextFunction, Request, Response, RequestHandler } from "express";
import { z } from "zod";
import { idSchema } from "~/lib/ids";
import {
  tariffInputSchema,
  tariffVersionInputSchema,
} from "~/tariffs/tariff-schema";
import {
  addTariffVersion,
  createTariff,
  listTariffs,
  type WriteOutcome,
} from "~/tariffs/tariffs.server";
import { auditActorOf } from "./principal.server";
import { sendError, sendValidationError } from "./respond.server";
import { orgPathSchema } from "./schemas";

export const tariffPathSchema = orgPathSchema.extend({ tariffId: idSchema() });

const handled =
  (handler: (req: Request, res: Response) => Promise<void>): RequestHandler =>
  (req: Request, res: Response, next: NextFunction) =>
    handler(req, res).catch(next);

function actorOf(res: Response) {
  const member = res.locals.member!;
  return { organizationId: member.organizationId, ...auditActorOf(member) };
}

function answer(res: Response, outcome: WriteOutcome, created: number) {
  if (outcome.ok) {
    res.status(created).json(outcome.tariff);
    return;
  }
  const code =
    outcome.status === 404
      ? "not_found"
      : outcome.status === 409
        ? "conflict"
        : "invalid_body";
  sendError(
    res,
    outcome.status,
    code,
    outcome.reason,
    outcome.field
      ? [{ path: outcome.field, message: outcome.reason }]
      : undefined,
  );
}

export const getTariffs = handled(async (_req, res) => {
  res.json({ tariffs: await listTariffs(res.locals.member!.organizationId) });
});

export const postTariff = handled(async (req, res) => {
  const body = tariffInputSchema.safeParse(req.body);
  if (!body.success) return sendValidationError(res, body.error);
  answer(res, await createTariff(actorOf(res), body.data), 201);
});

export const postTariffVersion = handled(async (req, res) => {
  const params = tariffPathSchema.safeParse(req.params);
  if (!params.success)
    return sendError(res, 404, "not_found", "No such tariff.");
  const body = tariffVersionInputSchema.safeParse(req.body);
  if (!body.success) return sendValidationError(res, body.error);
  answer(
    res,
    await addTariffVersion(actorOf(res), params.data.tariffId, body.data),
    201,
  );
});

export type TariffPath = z.infer<typeof tariffPathSchema>;
