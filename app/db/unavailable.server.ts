/**
 * What people and gateways get while PostgreSQL is away: 503 with a reason
 * and Retry-After, never a crash or a 500. A gateway that sees 503 keeps its
 * batch and sends it again later; nothing was stored, nothing acknowledged.
 */
import type { RequestHandler } from "express";
import { databaseReachable, pool } from "./client.server";
import {
  databaseAway,
  isDatabaseUnavailable,
  noteDatabaseError,
} from "./availability.server";

export const RETRY_AFTER_SECONDS = 5;

const MESSAGE =
  "Joulebook cannot reach its database just now. Nothing was changed; try again in a few seconds.";

export const unavailableApiBody = {
  error: { code: "database_unavailable", message: MESSAGE },
};

/** A page of its own: the app's shell needs the database it cannot reach. */
const unavailablePage = `<!doctype html>
<html lang="en-GB"><head><meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta http-equiv="refresh" content="${RETRY_AFTER_SECONDS}">
<title>Back in a moment · Joulebook</title>
<style>body{font-family:system-ui,sans-serif;color:#1c2430;background:#f4f3ee;max-width:36rem;margin:15vh auto;padding:0 1.25rem}
h1{font-size:1.5rem}p{color:#5b6675;line-height:1.5}</style></head>
<body><p><strong>Joulebook</strong></p><h1>Back in a moment</h1>
<p>${MESSAGE}</p><p>This page tries again by itself every ${RETRY_AFTER_SECONDS} seconds.</p></body></html>`;

/** Answers 503 in the request's own language: JSON on the API, a page for people. */
export function sendUnavailable(
  res: Parameters<RequestHandler>[1],
  api: boolean,
): void {
  res.status(503).set("Retry-After", String(RETRY_AFTER_SECONDS));
  if (api) res.json(unavailableApiBody);
  else res.type("html").send(unavailablePage);
}

/**
 * In front of everything but the health check: while the database is known
 * to be away, answer at once instead of making each request time out.
 */
export const databaseGate: RequestHandler = (req, res, next) => {
  if (!databaseAway() || req.path === "/api/v1/health") return next();
  sendUnavailable(res, req.path.startsWith("/api/"));
};

/** For error handlers: true (and the database marked away) when `error` is an outage. */
export function isOutage(error: unknown): boolean {
  if (!isDatabaseUnavailable(error)) return false;
  noteDatabaseError(pool, error);
  return true;
}

/**
 * For pages: a loader or action that failed because the database went away
 * in the middle of the request rendered a 500; make it the 503 page. A 500
 * for any other reason is left alone (one `select 1` tells which).
 */
export async function pageOrOutage(response: Response): Promise<Response> {
  if (response.status < 500) return response;
  if (!databaseAway() && (await databaseReachable())) return response;
  return new Response(unavailablePage, {
    status: 503,
    headers: {
      "Content-Type": "text/html; charset=utf-8",
      "Retry-After": String(RETRY_AFTER_SECONDS),
    },
  });
}
