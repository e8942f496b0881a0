/**
 * A new owner registers their organisation: user, organisation, owner
 * membership and billing account (Stripe customer, local trial) together.
 * It lives with billing because the trial starts here.
 */
import { randomUUID } from "node:crypto";
import { recordAudit } from "~/audit/record-audit.server";
import { createUser } from "~/auth/create-user.server";
import { findUserByEmail } from "~/auth/sign-in.server";
import { db } from "~/db/client.server";
import { billingAccounts, memberships, organizations } from "~/db/schema";
import { createStripeCustomer, newAccountValues } from "./account.server";

function isUniqueViolation(error: unknown): boolean {
  const e = error as { code?: string; cause?: { code?: string } };
  return (e.code ?? e.cause?.code) === "23505";
}

export type SignUpResult =
  | { ok: true; userId: string; organizationId: string }
  | { ok: false; reason: "email_taken" };

/**
 * The customer is created before the transaction (a network call must not
 * hold it open). If Stripe is away the sign-up still succeeds: the account
 * is then created on first need, with the same trial.
 */
async function customerOrNull(org: { id: string; name: string }) {
  try {
    return await createStripeCustomer(org);
  } catch (error) {
    console.error(
      `[billing] no Stripe customer at sign-up of ${org.id}; created later:`,
      (error as Error).message,
    );
    return null;
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
  const customerId = await customerOrNull({
    id: organizationId,
    name: input.organizationName,
  });
  try {
    const userId = await db.transaction(async (tx) => {
      const [org] = await tx
        .insert(organizations)
        .values({ id: organizationId, name: input.organizationName })
        .returning({ createdAt: organizations.createdAt });
      const id = await createUser(tx, input);
      await tx
        .insert(memberships)
        .values({ organizationId, userId: id, role: "owner" });
      if (customerId) {
        await tx.insert(billingAccounts).values(
          newAccountValues({
            organizationId,
            stripeCustomerId: customerId,
            trialStart: org.createdAt,
          }),
        );
      }
      await recordAudit(tx, {
        organizationId,
        actorUserId: id,
        action: "organization.created",
        subject: organizationId,
        details: { name: input.organizationName, via: "sign-up" },
      });
      return id;
    });
    return { ok: true, userId, organizationId };
  } catch (error) {
    // Two sign-ups with one address at once: the second meets the unique index.
    if (isUniqueViolation(error)) return { ok: false, reason: "email_taken" };
    throw error;
  }
}
