/**
 * The audit trail: every kind of change is recorded with who, when, why and
 * before/after, through the pages and API people use; owners and auditors
 * read it (JSON and CSV) with filters; no one reads another organisation's.
 */
import Papa from "papaparse";
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { Client } from "../support/http";
import { db, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

const stripeUrl = inject("stripeUrl");

afterAll(() => pool.end());
beforeAll(async () => {
  await db.delete(schema.signInAttempts);
});

interface Entry {
  id: number;
  occurred_at: string;
  action: string;
  action_label: string;
  kind: string;
  actor: { type: string; id: string | null; name: string };
  site: { id: string; name: string } | null;
  meter: { id: string; code: string } | null;
  subject: string;
  reason: string | null;
  changes: { field: string; before: string; after: string }[];
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
}

async function signedIn(member: { email: string; password: string }) {
  const client = new Client();
  await client.signIn(member.email, member.password);
  return client;
}

const api = (orgId: string, query = "") =>
  `/api/v1/orgs/${orgId}/audit${query ? `?${query}` : ""}`;

async function trail(client: Client, orgId: string, query = "") {
  const response = await client.get(
    api(orgId, `${query}${query ? "&" : ""}limit=500`),
  );
  expect(response.status, query).toBe(200);
  const body = (await response.json()) as {
    entries: Entry[];
    next_before: number | null;
  };
  expect(body.next_before).toBeNull();
  return body.entries;
}

async function csvRows(client: Client, orgId: string, query = "") {
  const response = await client.get(
    `/api/v1/orgs/${orgId}/audit.csv${query ? `?${query}` : ""}`,
  );
  expect(response.status, query).toBe(200);
  expect(response.headers.get("content-type")).toContain("text/csv");
  return Papa.parse<string[]>((await response.text()).trim()).data;
}

const one = (entries: Entry[], action: string) => {
  const found = entries.filter((e) => e.action === action);
  expect(found, action).toHaveLength(1);
  return found[0];
};

const register = (code: string, time: string, kwh: number) => ({
  meter: code,
  quantity: "electric_register",
  time,
  register_kwh: kwh,
});

async function postReadings(org: MeteredOrg, readings: unknown[]) {
  const response = await new Client().postJson(
    "/api/v1/readings",
    { readings },
    { authorization: `Bearer ${org.gatewayKey}` },
  );
  expect(response.status).toBe(200);
}

/** The meter form as the page posts it, for the export register. */
const exportMeterFields = (org: MeteredOrg, name: string) => ({
  intent: "save-meter",
  code: org.meters.export.code,
  name,
  quantity: "electric_register",
  carrier: "electricity",
  orientation: "export",
  parentMeterId: "",
  position: "boundary",
  serial: "",
  multiplier: "",
  rolloverKwh: "",
  sensorAt: "",
  defaultPressureBarAbs: "",
  spikeFactor: "",
  accuracyClass: "",
  deltaThetaMinK: "",
  qpM3PerH: "",
  installedAt: "2020-01-01",
});

/** Subscribes through the Billing page and the fake's Checkout page. */
async function subscribe(client: Client, orgId: string) {
  const page = await (await client.get(`/o/${orgId}/billing`)).text();
  const attempt = /name="attempt" value="([0-9a-f-]{36})"/.exec(page)![1];
  const started = await client.post(`/o/${orgId}/billing`, {
    intent: "subscribe",
    attempt,
  });
  expect(started.status).toBe(303);
  const checkout = await (await fetch(started.headers.get("location")!)).text();
  const action = /<form method="post" action="([^"]+)"/.exec(checkout)![1];
  const card = /name="card_number" value="([^"]+)"/.exec(checkout)![1];
  const paid = await fetch(new URL(action, stripeUrl), {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({ card_number: card }).toString(),
    redirect: "manual",
  });
  expect(paid.status).toBe(303);
  await fetch(`${stripeUrl}/_fake/flush`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: "{}",
  });
}

describe("who may open the audit trail", () => {
  it("owners and auditors; energy managers and finance get 403; another organisation's owner 404", async () => {
    const org = await createMeteredOrg({
      roles: ["owner", "auditor", "energy_manager", "finance"],
    });
    const other = await createMeteredOrg({ roles: ["owner"] });
    const [owner, auditor, manager, finance] = await Promise.all(
      org.org.members.map(signedIn),
    );
    const stranger = await signedIn(other.org.members[0]);
    const paths = [
      `/o/${org.org.id}/audit`,
      api(org.org.id),
      `/api/v1/orgs/${org.org.id}/audit.csv`,
    ];
    for (const path of paths) {
      expect((await owner.get(path)).status, path).toBe(200);
      expect((await auditor.get(path)).status, path).toBe(200);
      expect((await manager.get(path)).status, path).toBe(403);
      expect((await finance.get(path)).status, path).toBe(403);
      expect((await stranger.get(path)).status, path).toBe(404);
    }
    expect((await new Client().get(api(org.org.id))).status).toBe(401);
    // The navigation offers the page to those who may open it.
    const auditLink = `href="/o/${org.org.id}/audit"`;
    expect(await (await owner.get(`/o/${org.org.id}`)).text()).toContain(
      auditLink,
    );
    expect(await (await auditor.get(`/o/${org.org.id}`)).text()).toContain(
      auditLink,
    );
    expect(await (await manager.get(`/o/${org.org.id}`)).text()).not.toContain(
      auditLink,
    );
    expect(await (await finance.get(`/o/${org.org.id}`)).text()).not.toContain(
      auditLink,
    );
  });
});

describe("what the audit trail records", () => {
  let org: MeteredOrg;
  let other: MeteredOrg;
  let owner: Client;
  let manager: Client;
  let auditor: Client;
  let all: Entry[];
  const gatewayName = "Boiler house";
  let issuedKey: string;
  const swapReason = "Register failed its annual check";
  const correctionReason = "Register misread on the site visit";
  const reopenReason = "Late reads from the pavilion gateway";

  beforeAll(async () => {
    org = await createMeteredOrg({
      roles: ["owner", "energy_manager", "auditor", "finance"],
    });
    other = await createMeteredOrg({ roles: ["owner"] });
    [owner, manager, auditor] = await Promise.all(
      org.org.members.slice(0, 3).map(signedIn),
    );
    const orgPage = `/o/${org.org.id}`;

    // Meters: a name change, a save that changes nothing, then a swap.
    const meterPage = `${orgPage}/meters/${org.meters.export.id}`;
    expect(
      (await manager.post(meterPage, exportMeterFields(org, "Roof solar")))
        .status,
    ).toBe(200);
    expect(
      (await manager.post(meterPage, exportMeterFields(org, "Roof solar")))
        .status,
    ).toBe(200);
    const swapped = await manager.post(meterPage, {
      intent: "replace",
      code: `R-${org.tag}`,
      serial: "SN-2",
      swappedAt: "2026-04-01",
      reason: swapReason,
    });
    expect(swapped.status).toBe(302);

    // A gateway key issued and revoked.
    const created = await manager.post(`${orgPage}/gateways`, {
      intent: "create",
      name: gatewayName,
    });
    expect(created.status).toBe(200);
    issuedKey = /jbgw_[A-Za-z0-9_-]{43}/.exec(await created.text())![0];
    const [gateway] = await db
      .select({ id: schema.gateways.id })
      .from(schema.gateways)
      .where(
        and(
          eq(schema.gateways.organizationId, org.org.id),
          eq(schema.gateways.name, gatewayName),
        ),
      );
    expect(
      (
        await manager.post(`${orgPage}/gateways`, {
          intent: "revoke",
          gatewayId: gateway.id,
          confirm: "yes",
        })
      ).status,
    ).toBe(200);

    // A role changed by the owner.
    expect(
      (
        await owner.post(`${orgPage}/members`, {
          intent: "change-role",
          userId: org.org.members[3].id,
          role: "auditor",
        })
      ).status,
    ).toBe(200);

    // February closed; late data, then a correction, change it; reopened.
    const code = org.meters.register.code;
    await postReadings(org, [
      register(code, "2026-02-10T00:00:00Z", 100),
      register(code, "2026-02-10T02:00:00Z", 110),
    ]);
    expect(
      (
        await manager.post(`${orgPage}/ledger`, {
          intent: "close",
          month: "2026-02",
          siteId: "",
        })
      ).status,
    ).toBe(200);
    await postReadings(org, [register(code, "2026-02-10T04:00:00Z", 125)]);
    expect(
      (
        await manager.post(
          `${orgPage}/meters/${org.meters.register.id}/readings`,
          {
            intent: "edit",
            intervalStart: "2026-02-10T03:00:00Z",
            energyKwh: "10",
            reason: correctionReason,
          },
        )
      ).status,
    ).toBe(200);
    expect(
      (
        await owner.post(`${orgPage}/ledger`, {
          intent: "reopen",
          month: "2026-02",
          siteId: "",
          reason: reopenReason,
        })
      ).status,
    ).toBe(200);

    // Billing: the account opens with the trial, then a subscription.
    await subscribe(owner, org.org.id);

    // Something in the other organisation, which must never show here.
    const otherOwner = await signedIn(other.org.members[0]);
    expect(
      (
        await otherOwner.post(
          `/o/${other.org.id}/meters/${other.meters.export.id}`,
          exportMeterFields(other, "Their solar"),
        )
      ).status,
    ).toBe(200);

    all = await trail(auditor, org.org.id);
  });

  it("meter changes and swaps: who, why, and only the fields that changed", () => {
    const manager = org.org.members[1];
    const updated = one(all, "meter.updated");
    expect(updated).toMatchObject({
      kind: "meter",
      action_label: "Meter settings changed",
      actor: { type: "person", id: manager.id },
      site: { id: org.siteId },
      meter: { id: org.meters.export.id, code: org.meters.export.code },
    });
    expect(updated.changes).toEqual([
      { field: "Name", before: `Solar export ${org.tag}`, after: "Roof solar" },
    ]);
    const replaced = one(all, "meter.replaced");
    expect(replaced).toMatchObject({
      action_label: "Meter swapped",
      actor: { id: manager.id },
      reason: swapReason,
      meter: { id: org.meters.export.id },
    });
    expect(replaced.changes).toEqual([
      { field: "Code", before: org.meters.export.code, after: `R-${org.tag}` },
      { field: "Serial number", before: "—", after: "SN-2" },
      { field: "Removed on", before: "—", after: "1 Apr 2026" },
      { field: "Replaced by", before: "—", after: `R-${org.tag}` },
    ]);
    expect(Date.parse(replaced.occurred_at)).toBeGreaterThan(
      Date.now() - 10 * 60_000,
    );
  });

  it("gateway keys: issued and revoked, without the key itself", () => {
    const issued = one(all, "gateway.created");
    expect(issued).toMatchObject({
      subject: gatewayName,
      actor: { id: org.org.members[1].id },
    });
    expect(issued.changes).toContainEqual({
      field: "Key starts with",
      before: "—",
      after: issuedKey.slice(0, 12),
    });
    expect(one(all, "gateway.revoked").changes).toEqual([
      { field: "State", before: "Active", after: "Revoked" },
    ]);
    expect(JSON.stringify(all)).not.toContain(issuedKey);
  });

  it("members and roles", () => {
    const changed = one(all, "member.role_changed");
    const finance = org.org.members[3];
    expect(changed).toMatchObject({
      kind: "member",
      actor: { id: org.org.members[0].id },
      subject: expect.stringContaining(finance.email),
    });
    expect(changed.changes).toEqual([
      { field: "Role", before: "Finance", after: "Auditor" },
    ]);
  });

  it("month close and reopen, corrections and adjusting entries, with the gateway or person behind each", () => {
    const [owner, manager] = org.org.members;
    expect(one(all, "month.closed")).toMatchObject({
      kind: "month",
      actor: { id: manager.id },
      subject: "February 2026, whole organisation",
      changes: [{ field: "State", before: "Open", after: "Closed" }],
    });
    expect(one(all, "month.reopened")).toMatchObject({
      actor: { id: owner.id },
      reason: reopenReason,
      changes: [{ field: "State", before: "Closed", after: "Open" }],
    });
    const correction = one(all, "interval.edited");
    expect(correction).toMatchObject({
      kind: "correction",
      actor: { id: manager.id },
      reason: correctionReason,
      site: { id: org.siteId },
      meter: { id: org.meters.register.id },
      subject: "Hour from 10 Feb 2026, 03:00 (Europe/London)",
    });
    expect(correction.changes).toEqual([
      { field: "Energy", before: "7.5 kWh", after: "10 kWh" },
      { field: "Quality", before: "Estimated", after: "Corrected by hand" },
    ]);
    const adjustments = all.filter((e) => e.action === "ledger.adjusted");
    // Newest first: the correction's entry, then the late reading's.
    expect(adjustments).toHaveLength(2);
    expect(adjustments[1]).toMatchObject({
      kind: "adjustment",
      actor: { type: "gateway", id: org.gatewayId },
      reason: "readings received (api)",
      site: { id: org.siteId },
      meter: { id: org.meters.register.id },
      subject: "February 2026",
      changes: [{ field: "Energy", before: "10 kWh", after: "25 kWh" }],
    });
    expect(adjustments[1].actor.name).toContain("Test gateway");
    expect(adjustments[0]).toMatchObject({
      actor: { type: "person", id: manager.id },
      reason: correctionReason,
      changes: [{ field: "Energy", before: "25 kWh", after: "27.5 kWh" }],
    });
  });

  it("billing state: the trial, then the subscription Stripe reports", async () => {
    const opened = one(all, "billing.opened");
    expect(opened).toMatchObject({
      kind: "billing",
      actor: { type: "system", name: "Joulebook" },
      reason: "Free trial started",
    });
    expect(opened.changes[0]).toEqual({
      field: "Subscription status",
      before: "—",
      after: "Trial",
    });
    const subscribed = all.find(
      (e) =>
        e.action === "billing.subscription_changed" &&
        e.changes.some((c) => c.field === "Subscription status"),
    );
    expect(subscribed).toMatchObject({
      actor: { type: "system", name: "Stripe" },
      reason: expect.stringMatching(/^Stripe event /),
    });
    expect(subscribed!.changes).toContainEqual({
      field: "Subscription status",
      before: "Trial",
      after: "Active",
    });
  });

  it("filters by kind, person, site, meter and period, only ever within the organisation", async () => {
    const kinds = async (query: string) =>
      (await trail(auditor, org.org.id, query)).map((e) => e.action).sort();
    expect(await kinds("kind=adjustment")).toEqual([
      "ledger.adjusted",
      "ledger.adjusted",
    ]);
    expect(await kinds("kind=meter")).toEqual([
      "meter.replaced",
      "meter.updated",
    ]);
    expect(await kinds(`meter=${org.meters.export.id}`)).toEqual([
      "meter.replaced",
      "meter.updated",
    ]);
    const owner = org.org.members[0];
    const byOwner = await trail(auditor, org.org.id, `person=${owner.id}`);
    expect(byOwner.length).toBeGreaterThan(0);
    expect(byOwner.every((e) => e.actor.id === owner.id)).toBe(true);
    expect(byOwner.map((e) => e.action)).toContain("member.role_changed");
    const onSite = await trail(auditor, org.org.id, `site=${org.siteId}`);
    expect(onSite.every((e) => e.site?.id === org.siteId)).toBe(true);
    expect(onSite.map((e) => e.action)).toEqual(
      expect.arrayContaining(["meter.updated", "interval.edited"]),
    );
    expect(onSite.map((e) => e.action)).not.toContain("gateway.created");

    // Another organisation's ids find nothing, not their entries.
    expect(await trail(auditor, org.org.id, `site=${other.siteId}`)).toEqual(
      [],
    );
    expect(
      await trail(auditor, org.org.id, `meter=${other.meters.export.id}`),
    ).toEqual([]);
    expect(
      await trail(auditor, org.org.id, `person=${other.org.members[0].id}`),
    ).toEqual([]);
    expect(JSON.stringify(all)).not.toContain("Their solar");

    // Days are read in the time zone given: 23:30 UTC on 15 June is the
    // 16th in London.
    const moved = one(all, "member.role_changed");
    await db
      .update(schema.auditLog)
      .set({ occurredAt: new Date("2025-06-15T23:30:00Z") })
      .where(
        and(
          eq(schema.auditLog.organizationId, org.org.id),
          eq(schema.auditLog.id, moved.id),
        ),
      );
    const day = "from=2025-06-16&to=2025-06-16";
    expect(await kinds(`${day}&tz=Europe/London`)).toEqual([
      "member.role_changed",
    ]);
    expect(await kinds(day)).toEqual([]);
    expect(await kinds("from=2025-06-15&to=2025-06-15")).toEqual([
      "member.role_changed",
    ]);
    expect(await kinds("to=2025-12-31")).toEqual(["member.role_changed"]);
  });

  it("pages through the entries newest first", async () => {
    const seen: number[] = [];
    let before: number | null = null;
    do {
      const response = await auditor.get(
        api(org.org.id, `limit=3${before ? `&before=${before}` : ""}`),
      );
      expect(response.status).toBe(200);
      const page = (await response.json()) as {
        entries: Entry[];
        next_before: number | null;
      };
      expect(page.entries.length).toBeLessThanOrEqual(3);
      seen.push(...page.entries.map((e) => e.id));
      before = page.next_before;
    } while (before !== null);
    const everything = await trail(auditor, org.org.id);
    expect(seen).toEqual(everything.map((e) => e.id));
  });

  it("exports CSV in the page's words, only the organisation's own, with formulas neutralised", async () => {
    const hostile = '=HYPERLINK("http://evil.example","x")';
    expect(
      (
        await manager.post(`/o/${org.org.id}/ledger`, {
          intent: "close",
          month: "2026-02",
          siteId: "",
        })
      ).status,
    ).toBe(200);
    expect(
      (
        await owner.post(`/o/${org.org.id}/ledger`, {
          intent: "reopen",
          month: "2026-02",
          siteId: "",
          reason: hostile,
        })
      ).status,
    ).toBe(200);
    const [{ name: ownerName }] = await db
      .select({ name: schema.users.name })
      .from(schema.users)
      .where(eq(schema.users.id, org.org.members[0].id));
    const rows = await csvRows(auditor, org.org.id, "kind=month");
    expect(rows[0]).toEqual([
      "occurred_at_utc",
      "kind",
      "change",
      "who",
      "site",
      "meter",
      "subject",
      "reason",
      "before",
      "after",
      "entry_id",
    ]);
    const json = await trail(auditor, org.org.id, "kind=month");
    expect(rows.slice(1).map((r) => Number(r[10]))).toEqual(
      json.map((e) => e.id),
    );
    expect(rows[1]).toEqual([
      json[0].occurred_at,
      "Month close and reopen",
      "Month reopened",
      ownerName,
      "",
      "",
      "February 2026, whole organisation",
      `'${hostile}`,
      "State: Closed",
      "State: Open",
      String(json[0].id),
    ]);
    const everything = (await csvRows(auditor, org.org.id)).flat().join("\n");
    expect(everything).toContain(org.meters.export.code);
    expect(everything).not.toContain(other.meters.export.code);
    expect(everything).not.toContain("Their solar");
    expect(
      await csvRows(auditor, org.org.id, `site=${other.siteId}`),
    ).toHaveLength(1);
  });

  it("a closed month's adjusting entries: the Ledger row links to exactly those it counts", async () => {
    const code = org.meters.register.code;
    // Closed once more, and one more late reading since.
    expect(
      (
        await manager.post(`/o/${org.org.id}/ledger`, {
          intent: "close",
          month: "2026-02",
          siteId: "",
        })
      ).status,
    ).toBe(200);
    await postReadings(org, [register(code, "2026-02-10T05:00:00Z", 131)]);
    const ledger = await auditor.get(
      `/api/v1/orgs/${org.org.id}/ledger?from=2026-02&to=2026-02`,
    );
    const row = (
      (await ledger.json()) as {
        rows: {
          site_id: string;
          month: string;
          carrier: string;
          adjustment_count: number;
          closed_at: string;
        }[];
      }
    ).rows.find((r) => r.carrier === "electricity")!;
    expect(row.adjustment_count).toBe(1);
    const scope = new URLSearchParams({
      kind: "adjustment",
      site: row.site_id,
      month: row.month,
      carrier: row.carrier,
      since: row.closed_at,
    });
    const since = await trail(auditor, org.org.id, scope.toString());
    expect(since).toHaveLength(1);
    expect(since[0].changes).toEqual([
      { field: "Energy", before: "27.5 kWh", after: "33.5 kWh" },
    ]);
    scope.delete("since");
    expect(await trail(auditor, org.org.id, scope.toString())).toHaveLength(3);
    scope.set("carrier", "heat");
    expect(await trail(auditor, org.org.id, scope.toString())).toEqual([]);
  });
});

describe("bad filters", () => {
  it("answer 400 with the field named, for the entries and the CSV alike", async () => {
    const org = await createMeteredOrg({ roles: ["auditor"] });
    const auditor = await signedIn(org.org.members[0]);
    const cases: [string, string, string | null][] = [
      ["site=not-a-site", "invalid_body", "site"],
      ["meter=12", "invalid_body", "meter"],
      ["kind=everything", "invalid_body", "kind"],
      ["from=2026-02-30", "invalid_body", "from"],
      ["tz=Mars/Olympus", "invalid_body", "tz"],
      ["since=yesterday", "invalid_body", "since"],
      ["colour=red", "invalid_body", "(body)"],
      ["from=2026-03-01&to=2026-02-01", "invalid_range", null],
    ];
    for (const [query, code, path] of cases) {
      for (const route of ["audit", "audit.csv"]) {
        const response = await auditor.get(
          `/api/v1/orgs/${org.org.id}/${route}?${query}`,
        );
        expect(response.status, `${route}?${query}`).toBe(400);
        const body = (await response.json()) as {
          error: { code: string; issues?: { path: string }[] };
        };
        expect(body.error.code, query).toBe(code);
        if (path) expect(body.error.issues?.[0].path, query).toBe(path);
      }
    }
    for (const query of ["limit=0", "limit=501", "before=abc"]) {
      expect((await auditor.get(api(org.org.id, query))).status, query).toBe(
        400,
      );
    }
  });
});
