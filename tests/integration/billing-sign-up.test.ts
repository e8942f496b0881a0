/** /sign-up: a new owner, their organisation and its trial. */
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import Stripe from "stripe";
import { afterAll, beforeEach, describe, expect, inject, it } from "vitest";
import { Client, locationOf } from "../support/http";
import { db, pool, schema } from "../support/db";

const fakeAddress = new URL(inject("stripeUrl"));
const sdk = new Stripe("sk_test_joulebook", {
  host: fakeAddress.hostname,
  port: Number(fakeAddress.port),
  protocol: "http",
  maxNetworkRetries: 0,
  telemetry: false,
});

beforeEach(async () => {
  await db.delete(schema.signInAttempts);
});
afterAll(() => pool.end());

function form(overrides: Record<string, string> = {}) {
  const tag = randomUUID().slice(0, 8);
  return {
    organization: `Wrenfield Estates ${tag}`,
    name: "Mira Castell",
    email: `mira-${tag}@wrenfield.example`,
    password: "wrenfield-pass-1",
    confirm: "wrenfield-pass-1",
    ...overrides,
  };
}

async function usersWith(email: string) {
  return db.select().from(schema.users).where(eq(schema.users.email, email));
}

describe("signing up", () => {
  it("the sign-in page links to it", async () => {
    const html = await (await new Client().get("/sign-in")).text();
    expect(html).toContain('href="/sign-up"');
    expect((await new Client().get("/sign-up")).status).toBe(200);
  });

  it("creates the owner, the organisation and its trial, and signs in", async () => {
    const fields = form();
    const client = new Client();
    const response = await client.post("/sign-up", fields);
    expect(response.status).toBe(302);
    const organizationId = /^\/o\/([0-9a-f-]{36})$/.exec(
      locationOf(response),
    )![1];

    const [org] = await db
      .select()
      .from(schema.organizations)
      .where(eq(schema.organizations.id, organizationId));
    expect(org.name).toBe(fields.organization);
    const [user] = await usersWith(fields.email);
    expect(user.name).toBe("Mira Castell");
    const [membership] = await db
      .select()
      .from(schema.memberships)
      .where(eq(schema.memberships.organizationId, organizationId));
    expect(membership).toMatchObject({ userId: user.id, role: "owner" });

    const [account] = await db
      .select()
      .from(schema.billingAccounts)
      .where(eq(schema.billingAccounts.organizationId, organizationId));
    expect(account.status).toBe("trialing");
    expect(account.stripeSubscriptionId).toBeNull();
    const days =
      (account.trialEndsAt!.getTime() - org.createdAt.getTime()) / 86_400_000;
    expect(days).toBe(14);
    const customer = (await sdk.customers.retrieve(
      account.stripeCustomerId,
    )) as Stripe.Customer;
    expect(customer.metadata.organization_id).toBe(organizationId);

    // Signed in, landing on the new organisation.
    expect((await client.get(`/o/${organizationId}`)).status).toBe(200);
    const billing = await (
      await client.get(`/o/${organizationId}/billing`)
    ).text();
    expect(billing).toContain("Free trial");
    expect(billing).toContain("14 days left");
  });

  it("bad input is refused beside its field and creates nothing", async () => {
    const cases = [
      [{ password: "short", confirm: "short" }, "Use at least 10 characters."],
      [{ confirm: "something-else-1" }, "The two passwords differ."],
      [{ organization: "" }, "Enter the organisation&#x27;s name."],
      [{ email: "not-an-address" }, "Enter a valid e-mail address"],
    ] as const;
    for (const [change, message] of cases) {
      const fields = form(change);
      const response = await new Client().post("/sign-up", fields);
      expect(response.status, message).toBe(400);
      expect(await response.text()).toContain(message);
      expect(await usersWith(fields.email)).toHaveLength(0);
      const orgs = await db
        .select()
        .from(schema.organizations)
        .where(eq(schema.organizations.name, fields.organization));
      expect(orgs).toHaveLength(0);
    }
  });

  it("an address already in use is refused", async () => {
    const fields = form({ email: "owner@larchmere.example" });
    const response = await new Client().post("/sign-up", fields);
    expect(response.status).toBe(409);
    expect(await response.text()).toContain(
      "An account already uses this address",
    );
    const orgs = await db
      .select()
      .from(schema.organizations)
      .where(eq(schema.organizations.name, fields.organization));
    expect(orgs).toHaveLength(0);
  });
});
