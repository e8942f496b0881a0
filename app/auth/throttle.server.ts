/**
 * Throttles for what a stranger may repeat: guessing passwords, asking for
 * reset links, signing up. Every attempt is a row of `sign_in_attempts`, so
 * the limits hold across server processes and restarts.
 *
 * A limit is counted atomically by claiming first: the attempt's row is
 * committed, then the rows of its bucket are counted, its own included. Of any
 * number of simultaneous attempts, the k-th to commit sees at least k rows, so
 * at most `max` of them are admitted; a refused claim is deleted again, so
 * waiting out the window is always enough.
 */
import {
  and,
  count,
  eq,
  gt,
  inArray,
  isNull,
  min,
  sql,
  type SQL,
} from "drizzle-orm";
import { db } from "~/db/client.server";
import { signInAttempts } from "~/db/schema";

type AttemptKind = (typeof signInAttempts.kind.enumValues)[number];

export interface Limit {
  /** The rows this limit counts, besides the time window. */
  bucket: SQL | undefined;
  max: number;
  windowMinutes: number;
}

export type Claim =
  | { admitted: true; attemptId: number; rank: number }
  | { admitted: false; retryAfterSeconds: number };

async function countBucket(limit: Limit, now: Date) {
  const since = new Date(now.getTime() - limit.windowMinutes * 60_000);
  const [row] = await db
    .select({ attempts: count(), oldest: min(signInAttempts.attemptedAt) })
    .from(signInAttempts)
    .where(and(limit.bucket, gt(signInAttempts.attemptedAt, since)));
  return { attempts: row?.attempts ?? 0, oldest: row?.oldest ?? now };
}

function secondsUntil(oldest: Date, limit: Limit, now: Date): number {
  const until = new Date(oldest).getTime() + limit.windowMinutes * 60_000;
  return Math.max(1, Math.ceil((until - now.getTime()) / 1000));
}

/**
 * Records an attempt and admits it when every limit still has room for it.
 * `rank` is the attempt's place in the first limit's bucket (1 = first).
 */
export async function claimAttempt(
  attempt: {
    kind: AttemptKind;
    email: string;
    clientAddress: string;
    deviceHash?: string | null;
  },
  limits: Limit[],
  now = new Date(),
): Promise<Claim> {
  const [row] = await db
    .insert(signInAttempts)
    .values({ ...attempt, succeeded: false, attemptedAt: now })
    .returning({ id: signInAttempts.id });
  let rank = 0;
  for (const [i, limit] of limits.entries()) {
    const seen = await countBucket(limit, now);
    if (i === 0) rank = seen.attempts;
    if (seen.attempts > limit.max) {
      await db.delete(signInAttempts).where(eq(signInAttempts.id, row.id));
      return {
        admitted: false,
        retryAfterSeconds: secondsUntil(seen.oldest, limit, now),
      };
    }
  }
  return { admitted: true, attemptId: row.id, rank };
}

/**
 * Marks an admitted attempt as having succeeded: it no longer counts as a
 * failure. A sign-in's browser token is kept with it, so that browser is
 * trusted for that address from then on.
 */
export async function attemptSucceeded(
  attemptId: number,
  deviceHash?: string | null,
): Promise<void> {
  await db
    .update(signInAttempts)
    .set({ succeeded: true, ...(deviceHash ? { deviceHash } : {}) })
    .where(eq(signInAttempts.id, attemptId));
}

// ---------------------------------------------------------------- sign-in

export const SIGN_IN_WINDOW_MINUTES = 15;
/** Guesses at one address from one client (or one trusted browser). */
export const MAX_GUESSES_PER_ADDRESS = 5;
/** Failed sign-ins and sign-ups from one client address, over all addresses. */
export const MAX_FAILURES_PER_CLIENT = 100;
/** How long a browser that signed in stays trusted for that address. */
export const TRUSTED_DEVICE_DAYS = 180;

/**
 * Failures of one address from one client, since that client's last success
 * for it. A browser that has signed in to this address before (it carries a
 * trusted-device cookie) has a bucket of its own, so a stranger guessing from
 * the same office address cannot lock its owner out.
 */
function guessBucket(
  email: string,
  clientAddress: string,
  deviceHash: string | null,
) {
  const source = deviceHash
    ? eq(signInAttempts.deviceHash, deviceHash)
    : and(
        eq(signInAttempts.clientAddress, clientAddress),
        isNull(signInAttempts.deviceHash),
      );
  return and(
    eq(signInAttempts.kind, "sign-in"),
    eq(signInAttempts.email, email),
    source,
    eq(signInAttempts.succeeded, false),
    sql`${signInAttempts.attemptedAt} > coalesce((
      select max(s.attempted_at) from sign_in_attempts s
       where s.kind = 'sign-in' and s.email = ${email} and s.succeeded
         and ${
           deviceHash
             ? sql`s.device_hash = ${deviceHash}`
             : sql`s.client_address = ${clientAddress}`
         }), '-infinity')`,
  );
}

/**
 * Failed attempts from one client over every address. Trusted browsers skip
 * this limit, so people who have signed in before from an office behind one
 * address are not locked out by a stranger trying many accounts from it.
 */
function clientBucket(clientAddress: string) {
  return and(
    inArray(signInAttempts.kind, ["sign-in", "sign-up"]),
    eq(signInAttempts.clientAddress, clientAddress),
    isNull(signInAttempts.deviceHash),
    eq(signInAttempts.succeeded, false),
  );
}

/** Whether this browser has signed in to this address before. */
export async function isTrustedDevice(
  email: string,
  deviceHash: string,
  now = new Date(),
): Promise<boolean> {
  const since = new Date(now.getTime() - TRUSTED_DEVICE_DAYS * 86_400_000);
  const [row] = await db
    .select({ n: count() })
    .from(signInAttempts)
    .where(
      and(
        eq(signInAttempts.kind, "sign-in"),
        eq(signInAttempts.email, email),
        eq(signInAttempts.deviceHash, deviceHash),
        eq(signInAttempts.succeeded, true),
        gt(signInAttempts.attemptedAt, since),
      ),
    );
  return (row?.n ?? 0) > 0;
}

/** Claims one password guess; the caller judges it only when admitted. */
export function claimSignIn(
  email: string,
  clientAddress: string,
  trustedDeviceHash: string | null,
): Promise<Claim> {
  const window = SIGN_IN_WINDOW_MINUTES;
  const limits: Limit[] = [
    {
      bucket: guessBucket(email, clientAddress, trustedDeviceHash),
      max: MAX_GUESSES_PER_ADDRESS,
      windowMinutes: window,
    },
  ];
  if (!trustedDeviceHash)
    limits.push({
      bucket: clientBucket(clientAddress),
      max: MAX_FAILURES_PER_CLIENT,
      windowMinutes: window,
    });
  return claimAttempt(
    { kind: "sign-in", email, clientAddress, deviceHash: trustedDeviceHash },
    limits,
  );
}

// ---------------------------------------------------------- password reset

export const RESET_WINDOW_MINUTES = 60;
export const MAX_RESETS_PER_ADDRESS = 3;
export const MAX_RESETS_PER_CLIENT = 10;

/** Claims one reset-link request: a few an hour per address and per client. */
export function claimPasswordReset(
  email: string,
  clientAddress: string,
): Promise<Claim> {
  const kind = eq(signInAttempts.kind, "password-reset");
  return claimAttempt({ kind: "password-reset", email, clientAddress }, [
    {
      bucket: and(kind, eq(signInAttempts.email, email)),
      max: MAX_RESETS_PER_ADDRESS,
      windowMinutes: RESET_WINDOW_MINUTES,
    },
    {
      bucket: and(kind, eq(signInAttempts.clientAddress, clientAddress)),
      max: MAX_RESETS_PER_CLIENT,
      windowMinutes: RESET_WINDOW_MINUTES,
    },
  ]);
}

// ----------------------------------------------------------------- sign-up

export const SIGN_UP_WINDOW_MINUTES = 60;
export const MAX_SIGN_UPS_PER_CLIENT = 5;

/**
 * Each sign-up makes an organisation, a user with a password hash and a
 * Stripe customer, so a client may make only a few an hour. A failed sign-up
 * (the address is taken) stays a failure, so it also counts towards the
 * client's failed sign-ins: both answer whether an account exists.
 */
export function claimSignUp(
  email: string,
  clientAddress: string,
): Promise<Claim> {
  return claimAttempt({ kind: "sign-up", email, clientAddress }, [
    {
      bucket: and(
        eq(signInAttempts.kind, "sign-up"),
        eq(signInAttempts.clientAddress, clientAddress),
      ),
      max: MAX_SIGN_UPS_PER_CLIENT,
      windowMinutes: SIGN_UP_WINDOW_MINUTES,
    },
  ]);
}
