/**
 * Supplier bills end to end over the API: bills set against the metered kWh
 * and the computed cost (one agreed, one queried), the same bills again
 * change nothing, an unknown supply or a part month refuses the whole upload
 * and stores nothing, a manager's change of state keeps its history and an
 * audit entry, the queried bills export as CSV, an auditor reads but cannot
 * write, another organisation gets 404.
 */
import Decimal from "decimal.js-light";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createBillSupplies, type BillSupply } from "../support/bill-supplies";
import { Client } from "../support/http";
import { createOrganization, db, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

afterAll(() => pool.end());

interface BillAnswer {
  id: string;
  supply: string;
  kwh: string;
  amount: string;
  metered_kwh: string;
  computed_cost: string;
  state: string;
  note: string;
}

describe("supplier bills", () => {
  let org: MeteredOrg;
  let manager: Client;
  let auditor: Client;
  let finance: Client;
  let stranger: Client;
  let base: string;
  let supplies: BillSupply[];

  const storedBills = async () =>
    db
      .select()
      .from(schema.supplierBills)
      .where(eq(schema.supplierBills.organizationId, org.org.id));
  const bill = (supply: string, over: Record<string, string> = {}) => ({
    supply,
    period_from: "2026-01-01",
    period_to: "2026-01-31",
    kwh: "100",
    amount: "50",
    read_type: "actual",
    ...over,
  });

  beforeAll(async () => {
    await db.delete(schema.signInAttempts);
    org = await createMeteredOrg({
      roles: ["energy_manager", "auditor", "finance"],
    });
    const other = await createOrganization(["owner"]);
    manager = new Client();
    await manager.signIn(org.org.members[0].email, org.org.members[0].password);
    auditor = new Client();
    await auditor.signIn(org.org.members[1].email, org.org.members[1].password);
    finance = new Client();
    await finance.signIn(org.org.members[2].email, org.org.members[2].password);
    stranger = new Client();
    await stranger.signIn(other.members[0].email, other.members[0].password);
    base = `/api/v1/orgs/${org.org.id}`;
    supplies = await createBillSupplies(org, manager);
  });

  it("refuses an unknown supply or a part month with each row's reason, storing nothing", async () => {
    const [a] = supplies;
    const refused = await manager.postJson(`${base}/bills`, {
      bills: [
        bill(a.code),
        bill("NO-SUCH-METER"),
        bill(a.code, { period_from: "2026-02-15", period_to: "2026-02-28" }),
      ],
    });
    expect(refused.status).toBe(400);
    const body = (await refused.json()) as {
      error: { issues: { path: string; message: string }[] };
    };
    expect(body.error.issues).toEqual([
      {
        path: "bills.1",
        message: expect.stringContaining('Unknown supply "NO-SUCH-METER"'),
      },
      {
        path: "bills.2",
        message: expect.stringContaining("not the first day of a month"),
      },
    ]);
    const byAuditor = await auditor.postJson(`${base}/bills`, {
      bills: [bill(a.code)],
    });
    expect(byAuditor.status).toBe(403);
    expect(await storedBills()).toEqual([]);
  });

  it("agrees a bill within tolerance and queries one beyond it; the same bills again change nothing", async () => {
    const [a, b] = supplies;
    const dearer = new Decimal(b.computedCost).times("1.1").toString();
    const bills = {
      bills: [
        bill(a.code, { kwh: a.meteredKwh, amount: a.computedCost }),
        bill(b.tariffName, {
          kwh: b.meteredKwh,
          amount: dearer,
          read_type: "estimated",
        }),
      ],
    };
    const first = await manager.postJson(`${base}/bills`, bills);
    expect(first.status).toBe(200);
    expect(await first.json()).toEqual({
      stored: 2,
      already_stored: 0,
      agreed: 1,
      queried: 1,
    });
    const again = await manager.postJson(`${base}/bills`, bills);
    expect(await again.json()).toEqual({
      stored: 0,
      already_stored: 2,
      agreed: 0,
      queried: 0,
    });
    expect(await storedBills()).toHaveLength(2);

    const listed = await auditor.request(`${base}/bills`);
    expect(listed.status).toBe(200);
    const list = ((await listed.json()) as { bills: BillAnswer[] }).bills;
    const byCode = Object.fromEntries(list.map((x) => [x.supply, x]));
    for (const [label, s] of [
      [a.code, a],
      [b.tariffName, b],
    ] as const) {
      expect(new Decimal(byCode[label].metered_kwh).eq(s.meteredKwh)).toBe(
        true,
      );
      expect(new Decimal(byCode[label].computed_cost).eq(s.computedCost)).toBe(
        true,
      );
    }
    expect(byCode[a.code].state).toBe("agreed");
    expect(byCode[b.tariffName].state).toBe("queried");
    expect(byCode[b.tariffName].note).toMatch(
      /amount differs from the tariff's cost/,
    );

    // A different bill for a period already billed is refused, not overwritten.
    const clash = await manager.postJson(`${base}/bills`, {
      bills: [bill(a.code, { kwh: "1", amount: "1" })],
    });
    expect(clash.status).toBe(400);
    expect(JSON.stringify(await clash.json())).toContain(
      "A different bill for",
    );

    const csv = await auditor.request(`${base}/bills/queried.csv`);
    const text = await csv.text();
    expect(text.split("\r\n")).toHaveLength(2);
    expect(text).toContain(`${b.tariffName},2026-01-01,2026-01-31,estimated`);

    const queried = byCode[b.tariffName];
    const byAuditorState = await auditor.postJson(
      `${base}/bills/${queried.id}/state`,
      { state: "resolved", note: "Credit note" },
    );
    expect(byAuditorState.status).toBe(403);
    const resolved = await manager.postJson(
      `${base}/bills/${queried.id}/state`,
      {
        state: "resolved",
        note: "Credit note CN-1 received",
      },
    );
    expect(resolved.status).toBe(200);
    expect(await resolved.json()).toMatchObject({
      state: "resolved",
      note: "Credit note CN-1 received",
    });
    const history = await db
      .select()
      .from(schema.supplierBillEvents)
      .where(eq(schema.supplierBillEvents.billId, queried.id))
      .orderBy(schema.supplierBillEvents.id);
    expect(history.map((h) => [h.fromState, h.toState])).toEqual([
      [null, "queried"],
      ["queried", "resolved"],
    ]);
    const audit = await db
      .select()
      .from(schema.auditLog)
      .where(eq(schema.auditLog.subject, queried.id));
    expect(audit.map((e) => e.action)).toEqual(["bill.state_changed"]);

    // Finance settles bills too.
    const byFinance = await finance.postJson(
      `${base}/bills/${queried.id}/state`,
      { state: "queried", note: "Credit note not yet booked" },
    );
    expect(byFinance.status).toBe(200);
    const [latest] = await auditor
      .request(`${base}/bills?state=queried`)
      .then(async (r) => ((await r.json()) as { bills: BillAnswer[] }).bills);
    expect(latest).toMatchObject({
      id: queried.id,
      note: "Credit note not yet booked",
    });

    // Another organisation sees none of it.
    expect((await stranger.request(`${base}/bills`)).status).toBe(404);
    const foreign = await stranger.postJson(
      `${base}/bills/${queried.id}/state`,
      {
        state: "agreed",
        note: "x",
      },
    );
    expect(foreign.status).toBe(404);
  });
});
