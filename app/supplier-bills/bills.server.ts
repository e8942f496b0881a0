/**
 * Supplier bills: the upload (each bill checked against the metered kWh and
 * the computed cost of its supply and months, all or nothing), the list, a
 * manager's change of state with its note and history, the queried bills as
 * CSV for the supplier, and the organisation's tolerance (docs/costs.md).
 */
import { and, asc, desc, eq, sql } from "drizzle-orm";
import Papa from "papaparse";
import { recordAudit } from "~/audit/record-audit.server";
import { db, type Transaction } from "~/db/client.server";
import { billTolerances, supplierBillEvents, supplierBills } from "~/db/schema";
import { deliveredSignSql } from "~/ledger/delivered";
import { refreshStaleCosts, tariffMetersCte } from "~/tariffs/costs.server";
import {
  billMonths,
  compareBill,
  DEFAULT_TOLERANCE,
  type Tolerance,
} from "./bill-check";
import type { RowProblem } from "./bill-file";
import type { Bill, BillRow, BillState, ToleranceInput } from "./bill-schema";

/** Serialises bill uploads per organisation (with hashtext of its id). */
const BILLS_LOCK = 20_261_217;

export interface BillActor {
  organizationId: string;
  actorUserId: string | null;
  actorTokenId?: string | null;
}

export type UploadOutcome =
  | {
      ok: true;
      stored: number;
      alreadyStored: number;
      agreed: number;
      queried: number;
    }
  | { ok: false; problems: RowProblem[] };

interface Supply {
  tariffId: string;
  currency: string;
  siteId: string;
}

/** Every name a supply goes by in a bill file: its tariff's name and the code of each meter it prices. */
async function supplyNames(
  organizationId: string,
): Promise<Map<string, Supply>> {
  const { rows } = await db.execute<{
    name: string;
    tariff_id: string;
    currency: string;
    site_id: string;
  }>(sql`with ${tariffMetersCte}
     select m.code as name, t.id as tariff_id, t.currency, t.site_id from tariff_meters tm
       join tariffs t on t.organization_id = ${organizationId} and t.id = tm.tariff_id
       join meters m on m.organization_id = ${organizationId} and m.id = tm.meter_id
      where t.organization_id = ${organizationId}
     union all
     select t.name, t.id, t.currency, t.site_id from tariffs t
      where t.organization_id = ${organizationId}`);
  const names = new Map<string, Supply>();
  for (const r of rows)
    // A meter code wins over a tariff of the same name: codes are unique.
    if (!names.has(r.name))
      names.set(r.name, {
        tariffId: r.tariff_id,
        currency: r.currency,
        siteId: r.site_id,
      });
  return names;
}

interface CheckedRow {
  row: number;
  bill: BillRow;
  supply: Supply;
  months: string[];
}

function checkRows(
  rows: { row: number; bill: BillRow }[],
  names: Map<string, Supply>,
): { checked: CheckedRow[]; problems: RowProblem[] } {
  const problems: RowProblem[] = [];
  const checked: CheckedRow[] = [];
  const seen = new Map<string, number>();
  for (const { row, bill } of rows) {
    const supply = names.get(bill.supply);
    if (!supply) {
      problems.push({
        row,
        reason: `Unknown supply "${bill.supply}": no tariff prices a meter of that code, and no tariff has that name`,
      });
      continue;
    }
    const period = billMonths(bill.period_from, bill.period_to);
    if (!period.ok) {
      problems.push({ row, reason: period.reason });
      continue;
    }
    if (bill.currency && bill.currency !== supply.currency) {
      problems.push({
        row,
        reason: `The bill is in ${bill.currency}, the supply's tariff in ${supply.currency}`,
      });
      continue;
    }
    const key = `${supply.tariffId}|${bill.period_from}|${bill.period_to}`;
    const earlier = seen.get(key);
    if (earlier !== undefined) {
      problems.push({
        row,
        reason: `Row ${earlier} already bills this supply for the same period`,
      });
      continue;
    }
    seen.set(key, row);
    checked.push({ row, bill, supply, months: period.months });
  }
  return { checked, problems };
}

async function toleranceOf(
  tx: Transaction,
  organizationId: string,
): Promise<Tolerance> {
  const [row] = await tx
    .select()
    .from(billTolerances)
    .where(eq(billTolerances.organizationId, organizationId));
  return row
    ? {
        percent: row.percent,
        absoluteKwh: row.absoluteKwh,
        absoluteAmount: row.absoluteAmount,
      }
    : DEFAULT_TOLERANCE;
}

/** The supply's delivered kWh from its meters' monthly rollups, and its cost from monthly_costs, for the months. */
async function meteredAndComputed(
  tx: Transaction,
  organizationId: string,
  tariffId: string,
  months: string[],
): Promise<{ meteredKwh: string; computedCost: string }> {
  const from = months[0];
  const to = months[months.length - 1];
  const { rows: energy } = await tx.execute<{ kwh: string }>(sql`
    with ${tariffMetersCte}
    select coalesce(sum(${sql.raw(deliveredSignSql("m.carrier"))} * r.energy_kwh), 0)::text as kwh
      from tariff_meters tm
      join meters m on m.organization_id = ${organizationId} and m.id = tm.meter_id
      join monthly_rollups r on r.organization_id = ${organizationId} and r.meter_id = tm.meter_id
     where tm.tariff_id = ${tariffId}
       and r.month between to_date(${from}, 'YYYY-MM') and to_date(${to}, 'YYYY-MM')`);
  const { rows: cost } = await tx.execute<{ cost: string }>(sql`
    select coalesce(sum(cost), 0)::text as cost from monthly_costs
     where organization_id = ${organizationId} and tariff_id = ${tariffId}
       and month between to_date(${from}, 'YYYY-MM') and to_date(${to}, 'YYYY-MM')`);
  return { meteredKwh: energy[0].kwh, computedCost: cost[0].cost };
}

class Refused extends Error {
  constructor(readonly problems: RowProblem[]) {
    super("refused");
  }
}

/** Stores the bills of one file or API call, all or none; a bill already stored with the same figures is left as it is. */
export async function uploadBills(
  actor: BillActor,
  rows: { row: number; bill: BillRow }[],
): Promise<UploadOutcome> {
  const { organizationId } = actor;
  const { checked, problems } = checkRows(
    rows,
    await supplyNames(organizationId),
  );
  if (problems.length > 0) return { ok: false, problems };
  const allMonths = checked.flatMap((c) => c.months).sort();
  // The cost of months whose energy changed since it was computed, first.
  await refreshStaleCosts(
    organizationId,
    allMonths[0],
    allMonths[allMonths.length - 1],
  );
  try {
    return await db.transaction(async (tx) => {
      await tx.execute(
        sql`select pg_advisory_xact_lock(${BILLS_LOCK}, hashtext(${organizationId}))`,
      );
      const tolerance = await toleranceOf(tx, organizationId);
      const counts = { stored: 0, alreadyStored: 0, agreed: 0, queried: 0 };
      const clashes: RowProblem[] = [];
      for (const c of checked) {
        const existing = await existingBill(tx, organizationId, c);
        if (existing === "same") {
          counts.alreadyStored += 1;
          continue;
        }
        if (existing === "different") {
          clashes.push({
            row: c.row,
            reason: `A different bill for ${c.bill.supply} from ${c.bill.period_from} to ${c.bill.period_to} is already stored`,
          });
          continue;
        }
        const state = await storeBill(tx, actor, c, tolerance);
        counts.stored += 1;
        counts[state] += 1;
      }
      if (clashes.length > 0) throw new Refused(clashes);
      if (counts.stored > 0)
        await recordAudit(tx, {
          organizationId,
          actorUserId: actor.actorUserId,
          actorTokenId: actor.actorTokenId ?? null,
          action: "bills.uploaded",
          subject: organizationId,
          after: {
            stored: counts.stored,
            agreed: counts.agreed,
            queried: counts.queried,
          },
        });
      return { ok: true as const, ...counts };
    });
  } catch (error) {
    if (error instanceof Refused)
      return { ok: false, problems: error.problems };
    throw error;
  }
}

async function existingBill(
  tx: Transaction,
  organizationId: string,
  c: CheckedRow,
): Promise<"none" | "same" | "different"> {
  const { rows } = await tx.execute<{ same: boolean }>(sql`
    select (kwh = ${c.bill.kwh}::numeric and amount = ${c.bill.amount}::numeric
            and read_type = ${c.bill.read_type}) as same
      from supplier_bills
     where organization_id = ${organizationId} and tariff_id = ${c.supply.tariffId}
       and period_from = ${c.bill.period_from}::date and period_to = ${c.bill.period_to}::date`);
  if (rows.length === 0) return "none";
  return rows[0].same ? "same" : "different";
}

async function storeBill(
  tx: Transaction,
  actor: BillActor,
  c: CheckedRow,
  tolerance: Tolerance,
): Promise<"agreed" | "queried"> {
  const figures = await meteredAndComputed(
    tx,
    actor.organizationId,
    c.supply.tariffId,
    c.months,
  );
  const comparison = compareBill({
    kwh: c.bill.kwh,
    amount: c.bill.amount,
    ...figures,
    tolerance,
  });
  const note =
    comparison.state === "agreed"
      ? "Within tolerance of the meters and the tariff."
      : `Queried: ${comparison.reasons.join("; ")}.`;
  const [bill] = await tx
    .insert(supplierBills)
    .values({
      organizationId: actor.organizationId,
      tariffId: c.supply.tariffId,
      supplyLabel: c.bill.supply,
      periodFrom: c.bill.period_from,
      periodTo: c.bill.period_to,
      kwh: c.bill.kwh,
      amount: c.bill.amount,
      currency: c.supply.currency,
      readType: c.bill.read_type,
      meteredKwh: figures.meteredKwh,
      computedCost: figures.computedCost,
      state: comparison.state,
      note,
    })
    .returning({ id: supplierBills.id });
  await tx.insert(supplierBillEvents).values({
    organizationId: actor.organizationId,
    billId: bill.id,
    fromState: null,
    toState: comparison.state,
    note,
    actorUserId: actor.actorUserId,
  });
  return comparison.state;
}

const billColumnsForWire = {
  id: supplierBills.id,
  tariff_id: supplierBills.tariffId,
  supply: supplierBills.supplyLabel,
  period_from: supplierBills.periodFrom,
  period_to: supplierBills.periodTo,
  kwh: supplierBills.kwh,
  amount: supplierBills.amount,
  currency: supplierBills.currency,
  read_type: supplierBills.readType,
  metered_kwh: supplierBills.meteredKwh,
  computed_cost: supplierBills.computedCost,
  state: supplierBills.state,
  note: supplierBills.note,
  updated_at: supplierBills.updatedAt,
};

export async function listBills(
  organizationId: string,
  state?: BillState,
): Promise<Bill[]> {
  const rows = await db
    .select(billColumnsForWire)
    .from(supplierBills)
    .where(
      and(
        eq(supplierBills.organizationId, organizationId),
        state ? eq(supplierBills.state, state) : undefined,
      ),
    )
    .orderBy(desc(supplierBills.periodFrom), asc(supplierBills.supplyLabel));
  return rows.map((r) => ({
    ...r,
    read_type: r.read_type as Bill["read_type"],
    state: r.state as BillState,
    updated_at: r.updated_at.toISOString(),
  }));
}

export interface BillEvent {
  billId: string;
  fromState: string | null;
  toState: string;
  note: string;
  actorName: string | null;
  at: string;
}

/** Every bill's history, oldest first. */
export async function billHistory(
  organizationId: string,
): Promise<BillEvent[]> {
  const { rows } = await db.execute<{
    bill_id: string;
    from_state: string | null;
    to_state: string;
    note: string;
    actor_name: string | null;
    at: string;
  }>(sql`select e.bill_id, e.from_state, e.to_state, e.note, u.name as actor_name,
                to_char(e.created_at at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"') as at
           from supplier_bill_events e left join users u on u.id = e.actor_user_id
          where e.organization_id = ${organizationId}
          order by e.id`);
  return rows.map((r) => ({
    billId: r.bill_id,
    fromState: r.from_state,
    toState: r.to_state,
    note: r.note,
    actorName: r.actor_name,
    at: r.at,
  }));
}

/** A manager sets a bill's state with a note: kept in its history and the audit trail. Null: no such bill here. */
export async function changeBillState(
  actor: BillActor,
  billId: string,
  state: BillState,
  note: string,
): Promise<Bill | null> {
  const changed = await db.transaction(async (tx) => {
    const [bill] = await tx
      .select()
      .from(supplierBills)
      .where(
        and(
          eq(supplierBills.organizationId, actor.organizationId),
          eq(supplierBills.id, billId),
        ),
      )
      .for("update");
    if (!bill) return false;
    await tx
      .update(supplierBills)
      .set({ state, note, updatedAt: new Date() })
      .where(
        and(
          eq(supplierBills.organizationId, actor.organizationId),
          eq(supplierBills.id, billId),
        ),
      );
    await tx.insert(supplierBillEvents).values({
      organizationId: actor.organizationId,
      billId,
      fromState: bill.state,
      toState: state,
      note,
      actorUserId: actor.actorUserId,
    });
    await recordAudit(tx, {
      organizationId: actor.organizationId,
      actorUserId: actor.actorUserId,
      actorTokenId: actor.actorTokenId ?? null,
      action: "bill.state_changed",
      subject: billId,
      reason: note,
      before: { state: bill.state },
      after: { state },
      details: {
        supply: bill.supplyLabel,
        periodFrom: bill.periodFrom,
        periodTo: bill.periodTo,
      },
    });
    return true;
  });
  if (!changed) return null;
  return (
    (await listBills(actor.organizationId)).find((b) => b.id === billId) ?? null
  );
}

/** The queried bills as CSV for the supplier: what they billed, what was metered and priced, and why. */
export async function queriedBillsCsv(organizationId: string): Promise<string> {
  const bills = await listBills(organizationId, "queried");
  return Papa.unparse({
    fields: [
      "supply",
      "period_from",
      "period_to",
      "read_type",
      "billed_kwh",
      "metered_kwh",
      "billed_amount",
      "computed_cost",
      "currency",
      "note",
    ],
    data: bills.map((b) => [
      b.supply,
      b.period_from,
      b.period_to,
      b.read_type,
      b.kwh,
      b.metered_kwh,
      b.amount,
      b.computed_cost,
      b.currency,
      b.note,
    ]),
  });
}

export async function getTolerance(organizationId: string): Promise<Tolerance> {
  return db.transaction((tx) => toleranceOf(tx, organizationId));
}

export async function setTolerance(
  actor: BillActor,
  input: ToleranceInput,
): Promise<void> {
  await db.transaction(async (tx) => {
    const before = await toleranceOf(tx, actor.organizationId);
    const values = {
      percent: input.percent,
      absoluteKwh: input.absolute_kwh,
      absoluteAmount: input.absolute_amount,
      updatedAt: new Date(),
    };
    await tx
      .insert(billTolerances)
      .values({ organizationId: actor.organizationId, ...values })
      .onConflictDoUpdate({
        target: billTolerances.organizationId,
        set: values,
      });
    await recordAudit(tx, {
      organizationId: actor.organizationId,
      actorUserId: actor.actorUserId,
      actorTokenId: actor.actorTokenId ?? null,
      action: "bills.tolerance_set",
      subject: actor.organizationId,
      before: { ...before },
      after: {
        percent: input.percent,
        absoluteKwh: input.absolute_kwh,
        absoluteAmount: input.absolute_amount,
      },
    });
  });
}
