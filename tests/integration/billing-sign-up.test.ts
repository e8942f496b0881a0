/** /sign-up: a new owner, their organisation and its trial. */
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import Stripe from "stripe";
import { afterAll, beforeEach, describe, expect, inject, it } from "vitest";
import { Client, DEMO_PASSWORD, locationOf } from "../support/http";
import { db, pool, schema } from "../support/db";

const stripeUrl = inject("stripeUrl");
const fakeAddress = new URL(stripeUrl);
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

async function orgsNamed(name: string) {
  return db
    .select()
    .from(schema.organizations)
    .where(eq(schema.organizations.name, name));
}

/** How many customers the Stripe fake holds. */
async function stripeCustomers(): Promise<number> {
  const state = await (await fetch(`${stripeUrl}/_fake/state`)).json();
  return state.counts.customers;
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

  it("an address already in use is refused, and nothing is made in Stripe", async () => {
    const customersBefore = await stripeCustomers();
    const fields = form({ email: "owner@larchmere.example" });
    const response = await new Client().post("/sign-up", fields);
    expect(response.status).toBe(409);
    expect(await response.text()).toContain(
      "An account already uses this address",
    );
    expect(await orgsNamed(fields.organization)).toHaveLength(0);
    expect(await stripeCustomers()).toBe(customersBefore);
  });

  it("of simultaneous sign-ups with one address, one succeeds and only it gets a Stripe customer", async () => {
    const customersBefore = await stripeCustomers();
    const email = `race-${randomUUID().slice(0, 8)}@wrenfield.example`;
    const attempts = Array.from({ length: 4 }, () => form({ email }));
    const responses = await Promise.all(
      attempts.map((fields) => new Client().post("/sign-up", fields)),
    );
    const statuses = responses.map((r) => r.status).sort();
    expect(statuses).toEqual([302, 409, 409, 409]);
    expect(await usersWith(email)).toHaveLength(1);
    expect(await stripeCustomers()).toBe(customersBefore + 1);
    const winner = attempts[responses.findIndex((r) => r.status === 302)];
    const [org] = await orgsNamed(winner.organization);
    const [account] = await db
      .select()
      .from(schema.billingAccounts)
      .where(eq(schema.billingAccounts.organizationId, org.id));
    const customer = (await sdk.customers.retrieve(
      account.stripeCustomerId,
    )) as Stripe.Customer;
    expect(customer.metadata.organization_id).toBe(org.id);
  });
});

describe("sign-ups per client address", () => {
  it("five an hour; the sixth is refused with 429 and Retry-After, and creates nothing", async () => {
    // Refused forms do no work and do not count.
    const bad = await new Client().post("/sign-up", form({ confirm: "x" }));
    expect(bad.status).toBe(400);
    for (let i = 0; i < 5; i++) {
      const response = await new Client().post("/sign-up", form());
      expect(response.status, `sign-up ${i + 1}`).toBe(302);
    }
    const customersBefore = await stripeCustomers();
    const sixth = form();
    const refused = await new Client().post("/sign-up", sixth);
    expect(refused.status).toBe(429);
    const retryAfter = Number(refused.headers.get("retry-after"));
    expect(retryAfter).toBeGreaterThan(3_500);
    expect(retryAfter).toBeLessThanOrEqual(3_600);
    const html = await refused.text();
    expect(html).toContain(
      "Too many organisations were created from this network in the last hour. Try again in 60 minutes",
    );
    expect(await usersWith(sixth.email)).toHaveLength(0);
    expect(await orgsNamed(sixth.organization)).toHaveLength(0);
    expect(await stripeCustomers()).toBe(customersBefore);

    // Once the earliest sign-up is more than an hour old, one more fits.
    const [oldest] = await db
      .select()
      .from(schema.signInAttempts)
      .orderBy(schema.signInAttempts.id)
      .limit(1);
    await db
      .update(schema.signInAttempts)
      .set({ attemptedAt: new Date(Date.now() - 61 * 60_000) })
      .where(eq(schema.signInAttempts.id, oldest.id));
    expect((await new Client().post("/sign-up", form())).status).toBe(302);
    expect((await new Client().post("/sign-up", form())).status).toBe(429);
  });

  it("a refused sign-up does not stop the client from signing in", async () => {
    for (let i = 0; i < 5; i++)
      expect((await new Client().post("/sign-up", form())).status).toBe(302);
    expect((await new Client().post("/sign-up", form())).status).toBe(429);
    const client = new Client();
    const response = await client.post("/sign-in", {
      email: "owner@larchmere.example",
      password: DEMO_PASSWORD,
    });
    expect(response.status).toBe(302);
  });
});
