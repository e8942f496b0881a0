/**
 * Billing against the local Stripe fake: Checkout, quantity sync,
 * reconciliation, past due and the grace period, and who may do what.
 */
import { eq } from "drizzle-orm";
import Stripe from "stripe";
import {
  afterAll,
  beforeAll,
  beforeEach,
  describe,
  expect,
  inject,
  it,
} from "vitest";
import { Client } from "../support/http";
import { createOrganization, db, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";
import { meterFormFields } from "../support/forms";

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

async function signedIn(member: { email: string; password: string }) {
  const client = new Client();
  await client.signIn(member.email, member.password);
  return client;
}

const memberOf = (org: MeteredOrg, role: string) =>
  org.org.members.find((m) => m.role === role)!;

async function fake(path: string, body: unknown = {}) {
  const response = await fetch(`${stripeUrl}${path}`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify(body),
  });
  expect(response.status, path).toBe(200);
  return response.json();
}

/** Every event the fake has published has reached the app (or failed for good). */
const flush = () => fake("/_fake/flush");

async function account(organizationId: string) {
  const [row] = await db
    .select()
    .from(schema.billingAccounts)
    .where(eq(schema.billingAccounts.organizationId, organizationId));
  return row;
}

/** The attempt id the billing page rendered into its payment form. */
async function attemptOn(client: Client, organizationId: string) {
  const page = await client.get(`/o/${organizationId}/billing`);
  expect(page.status).toBe(200);
  const match = /name="attempt" value="([0-9a-f-]{36})"/.exec(
    await page.text(),
  );
  if (!match) throw new Error("no attempt id on the billing page");
  return match[1];
}

/** Subscribes through the page action and the fake's Checkout page. */
async function subscribe(client: Client, organizationId: string) {
  const attempt = await attemptOn(client, organizationId);
  const started = await client.post(`/o/${organizationId}/billing`, {
    intent: "subscribe",
    attempt,
  });
  expect(started.status).toBe(303);
  const checkoutUrl = started.headers.get("location")!;
  expect(checkoutUrl.startsWith(`${stripeUrl}/checkout/`)).toBe(true);
  const page = await (await fetch(checkoutUrl)).text();
  const action = /<form method="post" action="([^"]+)"/.exec(page)![1];
  const card = /name="card_number" value="([^"]+)"/.exec(page)![1];
  const paid = await fetch(new URL(action, stripeUrl), {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({ card_number: card }).toString(),
    redirect: "manual",
  });
  expect(paid.status).toBe(303);
  expect(paid.headers.get("location")).toContain(
    `/o/${organizationId}/billing?checkout=done`,
  );
  await flush();
  return checkoutUrl;
}

async function subscriptionQuantity(subscriptionId: string) {
  const subscription = await sdk.subscriptions.retrieve(subscriptionId);
  return subscription.items.data[0].quantity;
}

/** A new site with one meter, through the pages an energy manager uses. */
async function addMeteredSite(
  client: Client,
  organizationId: string,
  tag: string,
) {
  const created = await client.post(`/o/${organizationId}/sites`, {
    intent: "save-site",
    name: `Billing site ${tag}`,
    timeZone: "Europe/London",
    floorAreaM2: "",
    degreeDayBaseC: "15.5",
    address: "",
  });
  expect(created.status).toBe(302);
  const siteId = created.headers.get("location")!.split("/").pop()!;
  const meter = await client.post(
    `/o/${organizationId}/sites/${siteId}/meters/new`,
    meterFormFields({ code: `B-${tag}`, name: `Billing meter ${tag}` }),
  );
  expect(meter.status).toBe(302);
  const [row] = await db
    .select({ id: schema.meters.id })
    .from(schema.meters)
    .where(eq(schema.meters.code, `B-${tag}`));
  return { siteId, meterId: row.id };
}

describe("a subscription's life", () => {
  let org: MeteredOrg;
  let finance: Client;
  let owner: Client;

  beforeAll(async () => {
    org = await createMeteredOrg({
      roles: ["owner", "finance", "energy_manager", "auditor"],
    });
    finance = await signedIn(memberOf(org, "finance"));
    owner = await signedIn(memberOf(org, "owner"));
  });

  it("a new organisation is on its trial, with no subscription in Stripe", async () => {
    const page = await finance.get(`/o/${org.org.id}/billing`);
    const html = await page.text();
    expect(html).toContain("Free trial");
    expect(html).toContain("the paid plan starts at once");
    expect(html).toContain("£29.00");
    const row = await account(org.org.id);
    expect(row.status).toBe("trialing");
    expect(row.stripeSubscriptionId).toBeNull();
    const customer = await sdk.customers.retrieve(row.stripeCustomerId);
    expect((customer as Stripe.Customer).metadata.organization_id).toBe(
      org.org.id,
    );
  });

  it("finance subscribes through Checkout and the plan is active", async () => {
    await subscribe(finance, org.org.id);
    const row = await account(org.org.id);
    expect(row.status).toBe("active");
    expect(row.stripeSubscriptionId).toMatch(/^sub_/);
    expect(row.quantity).toBe(1);
    expect(row.currentPeriodEnd).not.toBeNull();
    const subscription = await sdk.subscriptions.retrieve(
      row.stripeSubscriptionId!,
    );
    expect(subscription.metadata.organization_id).toBe(org.org.id);

    const html = await (
      await finance.get(`/o/${org.org.id}/billing?checkout=done`)
    ).text();
    expect(html).toContain("Active");
    expect(html).toContain("the paid plan has started");
    expect(html).toContain("Manage payment and invoices");
    const invoices = await db
      .select()
      .from(schema.billingInvoices)
      .where(eq(schema.billingInvoices.organizationId, org.org.id));
    expect(invoices).toHaveLength(1);
    expect(invoices[0]).toMatchObject({ status: "paid", amountPaid: 2900 });
    expect(html).toContain(invoices[0].number ?? invoices[0].stripeInvoiceId);
  });

  it("a second subscribe is refused while the first is live", async () => {
    const attempt = "3f1d3c9e-5a57-4f59-9d7b-2a7f3b0d8a11";
    const again = await finance.post(`/o/${org.org.id}/billing`, {
      intent: "subscribe",
      attempt,
    });
    expect(again.status).toBe(409);
  });

  it("the billing portal opens for the organisation's customer", async () => {
    const attempt = await attemptOn(finance, org.org.id);
    const portal = await finance.post(`/o/${org.org.id}/billing`, {
      intent: "portal",
      attempt,
    });
    expect(portal.status).toBe(303);
    expect(portal.headers.get("location")).toMatch(
      new RegExp(`^${stripeUrl}/portal/`),
    );
  });

  let added: { siteId: string; meterId: string };

  it("adding a metered site raises the quantity to 2", async () => {
    const manager = await signedIn(memberOf(org, "energy_manager"));
    added = await addMeteredSite(manager, org.org.id, org.tag);
    const row = await account(org.org.id);
    expect(await subscriptionQuantity(row.stripeSubscriptionId!)).toBe(2);
    await flush();
    expect((await account(org.org.id)).quantity).toBe(2);
    const html = await (await finance.get(`/o/${org.org.id}/billing`)).text();
    expect(html).toContain(`Billing site ${org.tag}`);
  });

  it("retiring its only meter lowers it to 1", async () => {
    const retired = await owner.post(
      `/o/${org.org.id}/meters/${added.meterId}`,
      {
        intent: "retire",
        removedAt: "2026-01-01",
      },
    );
    expect(retired.status).toBe(200);
    const row = await account(org.org.id);
    expect(await subscriptionQuantity(row.stripeSubscriptionId!)).toBe(1);
  });

  it("reconciliation repairs a quantity changed in Stripe directly", async () => {
    const row = await account(org.org.id);
    const subscription = await sdk.subscriptions.retrieve(
      row.stripeSubscriptionId!,
    );
    await sdk.subscriptionItems.update(subscription.items.data[0].id, {
      quantity: 5,
    });
    expect(await subscriptionQuantity(row.stripeSubscriptionId!)).toBe(5);

    const check = await owner.post(`/o/${org.org.id}/billing`, {
      intent: "reconcile",
    });
    expect(check.status).toBe(200);
    expect(await check.text()).toContain(
      "Stripe billed 5 sites; it now bills 1",
    );
    expect(await subscriptionQuantity(row.stripeSubscriptionId!)).toBe(1);
    const after = await account(org.org.id);
    expect(after.quantity).toBe(1);
    expect(after.lastReconciledAt).not.toBeNull();

    const again = await owner.post(`/o/${org.org.id}/billing`, {
      intent: "reconcile",
    });
    expect(await again.text()).toContain("the same as the metered-site count");
  });

  it("past due: a banner for owner and finance, new sites refused after the grace, readings still accepted", async () => {
    const row = await account(org.org.id);
    await fake("/_fake/fail-next-payment", { customer: row.stripeCustomerId });
    await fake("/_fake/advance", { days: 32 });
    await flush();
    const behind = await account(org.org.id);
    expect(behind.status).toBe("past_due");
    expect(behind.pastDueSince).not.toBeNull();

    const banner = "A payment for Joulebook is overdue.";
    for (const client of [owner, finance]) {
      const html = await (await client.get(`/o/${org.org.id}/sites`)).text();
      expect(html).toContain(banner);
    }
    const manager = await signedIn(memberOf(org, "energy_manager"));
    const managerSites = await (
      await manager.get(`/o/${org.org.id}/sites`)
    ).text();
    expect(managerSites).not.toContain(banner);
    // Within the grace period sites can still be added.
    expect(managerSites).toContain("Add a site");

    await db
      .update(schema.billingAccounts)
      .set({ pastDueSince: new Date(Date.now() - 8 * 86_400_000) })
      .where(eq(schema.billingAccounts.organizationId, org.org.id));
    const blockedPage = await (
      await manager.get(`/o/${org.org.id}/sites`)
    ).text();
    expect(blockedPage).toContain("Adding sites is paused");
    expect(blockedPage).not.toContain("Add a site</h2>");
    const sitesBefore = await db
      .select()
      .from(schema.sites)
      .where(eq(schema.sites.organizationId, org.org.id));
    const refused = await manager.post(`/o/${org.org.id}/sites`, {
      intent: "save-site",
      name: "One site too many",
      timeZone: "Europe/London",
      floorAreaM2: "",
      degreeDayBaseC: "15.5",
      address: "",
    });
    expect(refused.status).toBe(402);
    expect(await refused.text()).toContain("New sites cannot be added");
    const sitesAfter = await db
      .select()
      .from(schema.sites)
      .where(eq(schema.sites.organizationId, org.org.id));
    expect(sitesAfter).toHaveLength(sitesBefore.length);

    const readings = await new Client().postJson(
      "/api/v1/readings",
      {
        readings: [
          {
            meter: org.meters.register.code,
            quantity: "electric_register",
            time: "2026-03-01T00:00:00Z",
            register_kwh: 100,
          },
        ],
      },
      { authorization: `Bearer ${org.gatewayKey}` },
    );
    expect(readings.status).toBe(200);
    expect((await readings.json()).accepted).toBe(1);
    // Stored data stays readable.
    expect((await manager.get(`/o/${org.org.id}/ledger`)).status).toBe(200);

    const billingPage = await (
      await finance.get(`/o/${org.org.id}/billing`)
    ).text();
    expect(billingPage).toContain("Past due");
    expect(billingPage).toContain("The grace period has ended");
  });
});

describe("a Checkout paid after the estate grew", () => {
  it("bills the metered sites at payment, not those when Checkout opened", async () => {
    const org = await createMeteredOrg({
      roles: ["finance", "energy_manager"],
    });
    const finance = await signedIn(memberOf(org, "finance"));
    const attempt = await attemptOn(finance, org.org.id);
    const started = await finance.post(`/o/${org.org.id}/billing`, {
      intent: "subscribe",
      attempt,
    });
    expect(started.status).toBe(303);
    const checkoutUrl = started.headers.get("location")!;
    const page = await (await fetch(checkoutUrl)).text();
    // Checkout was opened for the one metered site.
    expect(page).toContain("£29.00");

    // A second site gets its meter while the Checkout tab is still open.
    const manager = await signedIn(memberOf(org, "energy_manager"));
    await addMeteredSite(manager, org.org.id, `${org.tag}-late`);

    const action = /<form method="post" action="([^"]+)"/.exec(page)![1];
    const card = /name="card_number" value="([^"]+)"/.exec(page)![1];
    const paid = await fetch(new URL(action, stripeUrl), {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ card_number: card }).toString(),
      redirect: "manual",
    });
    expect(paid.status).toBe(303);
    await flush();

    const row = await account(org.org.id);
    expect(row.stripeSubscriptionId).toMatch(/^sub_/);
    // The sync after linking runs beside the webhook's answer; wait for it.
    const deadline = Date.now() + 10_000;
    while (
      (await subscriptionQuantity(row.stripeSubscriptionId!)) !== 2 &&
      Date.now() < deadline
    )
      await new Promise((r) => setTimeout(r, 100));
    expect(await subscriptionQuantity(row.stripeSubscriptionId!)).toBe(2);
    await flush();
    expect((await account(org.org.id)).quantity).toBe(2);
  });
});

describe("who may see and change billing", () => {
  it("energy managers and auditors get 403 on the page and its actions", async () => {
    const org = await createOrganization([
      "owner",
      "energy_manager",
      "auditor",
    ]);
    for (const member of org.members.slice(1)) {
      const client = await signedIn(member);
      expect(
        (await client.get(`/o/${org.id}/billing`)).status,
        member.role,
      ).toBe(403);
      for (const intent of ["subscribe", "portal", "reconcile"]) {
        const response = await client.post(`/o/${org.id}/billing`, {
          intent,
          attempt: "3f1d3c9e-5a57-4f59-9d7b-2a7f3b0d8a11",
        });
        expect(response.status, `${member.role} ${intent}`).toBe(403);
      }
    }
    // Nothing was created on their behalf.
    expect(await account(org.id)).toBeUndefined();
  });

  it("another organisation's owner gets 404", async () => {
    const mine = await createOrganization(["owner"]);
    const theirs = await createOrganization(["owner"]);
    const client = await signedIn(theirs.members[0]);
    expect((await client.get(`/o/${mine.id}/billing`)).status).toBe(404);
    const post = await client.post(`/o/${mine.id}/billing`, {
      intent: "reconcile",
    });
    expect(post.status).toBe(404);
  });

  it("the billing link is in the navigation only for owners and finance", async () => {
    const org = await createOrganization([
      "owner",
      "finance",
      "energy_manager",
    ]);
    const link = `href="/o/${org.id}/billing"`;
    for (const member of org.members) {
      const html = await (
        await (await signedIn(member)).get(`/o/${org.id}`)
      ).text();
      expect(html.includes(link), member.role).toBe(
        member.role !== "energy_manager",
      );
    }
  });
});

describe("an ended trial", () => {
  it("shows the banner, then refuses new sites after the grace period", async () => {
    const org = await createOrganization(["owner"]);
    const owner = await signedIn(org.members[0]);
    expect((await owner.get(`/o/${org.id}/billing`)).status).toBe(200);
    const day = 86_400_000;
    await db
      .update(schema.billingAccounts)
      .set({ trialEndsAt: new Date(Date.now() - 2 * day) })
      .where(eq(schema.billingAccounts.organizationId, org.id));
    const sites = await (await owner.get(`/o/${org.id}/sites`)).text();
    expect(sites).toContain("The free trial has ended.");
    expect(sites).toContain("Add a site");

    await db
      .update(schema.billingAccounts)
      .set({ trialEndsAt: new Date(Date.now() - 8 * day) })
      .where(eq(schema.billingAccounts.organizationId, org.id));
    const refused = await owner.post(`/o/${org.id}/sites`, {
      intent: "save-site",
      name: "After the trial",
      timeZone: "Europe/London",
      floorAreaM2: "",
      degreeDayBaseC: "15.5",
      address: "",
    });
    expect(refused.status).toBe(402);
    const billing = await (await owner.get(`/o/${org.id}/billing`)).text();
    expect(billing).toContain("Trial ended");
    expect(billing).toContain("Subscribe with Checkout");
  });

  it("an organisation made before billing gets its trial from its creation time", async () => {
    const org = await createOrganization(["owner"]);
    const created = new Date(Date.now() - 3 * 86_400_000);
    await db
      .update(schema.organizations)
      .set({ createdAt: created })
      .where(eq(schema.organizations.id, org.id));
    const owner = await signedIn(org.members[0]);
    const html = await (await owner.get(`/o/${org.id}/billing`)).text();
    expect(html).toContain("11 days left");
    const row = await account(org.id);
    expect(row.trialEndsAt!.getTime()).toBe(
      created.getTime() + 14 * 86_400_000,
    );
  });
});
