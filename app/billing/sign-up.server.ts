/**
 * A new owner registers their organisation: user, organisation and owner
 * membership in one transaction, then the billing account (Stripe customer,
 * local trial). It lives with billing because the trial starts here.
 */
import { randomUUID } from "node:crypto";
import { recordAudit } from "~/audit/record-audit.server";
import { createUser } from "~/auth/create-user.server";
import { findUserByEmail } from "~/auth/sign-in.server";
import { db } from "~/db/client.server";
import { isUniqueViolation } from "~/db/errors.server";
import { memberships, organizations } from "~/db/schema";
import { ensureBillingAccount } from "./account.server";

export type SignUpResult =
  | { ok: true; userId: string; organizationId: string }
  | { ok: false; reason: "email_taken" };

/**
 * The Stripe customer comes after the commit, through the same path as an
 * organisation's first billing page (idempotency key = organisation id, trial
 * from the organisation's creation): a sign-up that fails creates nothing in
 * Stripe, and if Stripe is away the sign-up still succeeds and the account
 * is opened on first need with the same trial.
 */
async function openBillingAccount(organizationId: string): Promise<void> {
  try {
    await ensureBillingAccount(organizationId);
  } catch (error) {
    console.error(
      `[billing] no Stripe customer at sign-up of ${organizationId}; created later:`,
      (error as Error).message,
    );
  }
}

export async function signUpOwner(input: {
  name: string;
  email: string;
  password: string;
  organizationName: string;
}): Promise<SignUpResult> {
  if (await findUserByEmail(input.email))
    return { ok: false, reason: "email_taken" };
  const organizationId = randomUUID();
  let userId: string;
  try {
    userId = await db.transaction(async (tx) => {
      await tx
        .insert(organizations)
        .values({ id: organizationId, name: input.organizationName });
      const id = await createUser(tx, input);
      await tx
        .insert(memberships)
        .values({ organizationId, userId: id, role: "owner" });
      await recordAudit(tx, {
        organizationId,
        actorUserId: id,
        action: "organization.created",
        subject: organizationId,
        after: { name: input.organizationName },
        details: { via: "sign-up" },
      });
      return id;
    });
  } catch (error) {
    // Two sign-ups with one address at once: the second meets the unique index.
    if (isUniqueViolation(error)) return { ok: false, reason: "email_taken" };
    throw error;
  }
  await openBillingAccount(organizationId);
  return { ok: true, userId, organizationId };
}
