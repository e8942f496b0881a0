// The demo estate's plant, as seeded: the depot's gas boiler house, the
// sheltered housing's heat pump and the pool's hydrogen fuel cell show
// plausible monthly figures, and the one planted fault (the boiler house
// heat meter over-reading in February 2026) is flagged, on the Plant page
// and in a signed report's data.
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { BOILER_FAULT, SITE } from "../../seeds/scenario/larchmere-estate";
import { db, organizationId, pool, schema } from "../support/db";
import { Client } from "../support/http";

afterAll(() => pool.end());

let larchmere: string;
let owner: Client;

async function plantPage(siteName: string): Promise<string> {
  const [site] = await db
    .select({ id: schema.sites.id })
    .from(schema.sites)
    .where(
      and(
        eq(schema.sites.organizationId, larchmere),
        eq(schema.sites.name, siteName),
      ),
    );
  const response = await owner.get(`/o/${larchmere}/sites/${site.id}/plant`);
  expect(response.status).toBe(200);
  return response.text();
}

/** Each month row of the page's table: its month and its cells' text. */
function monthRows(html: string) {
  const rows: { month: string; cells: string[] }[] = [];
  for (const m of html.matchAll(
    /<tr[^>]*data-month="(\d{4}-\d{2})"[^>]*>(.*?)<\/tr>/gs,
  )) {
    const cells = [...m[2].matchAll(/<td[^>]*>(.*?)<\/td>/gs)].map((c) =>
      c[1].replace(/<!-- -->/g, "").replace(/<[^>]+>/g, ""),
    );
    rows.push({ month: m[1], cells });
  }
  return rows;
}

const percent = (text: string) => Number(text.replace(/[^\d.]/g, ""));

beforeAll(async () => {
  await db.delete(schema.signInAttempts);
  larchmere = await organizationId("Larchmere Borough Estates");
  owner = new Client();
  await owner.signIn("owner@larchmere.example");
});

describe("the demo's plant", () => {
  it("flags the boiler house's planted month above 100 % and passes the others at 80–92 % gross", async () => {
    const rows = monthRows(await plantPage(SITE.depot));
    expect(rows.length).toBeGreaterThanOrEqual(12);
    for (const row of rows) {
      const efficiency = percent(row.cells[3]);
      if (row.month === BOILER_FAULT.month) {
        expect(efficiency).toBeGreaterThan(100);
        expect(row.cells.at(-1)).toContain("Metering fault");
      } else {
        expect(efficiency, row.month).toBeGreaterThan(80);
        expect(efficiency, row.month).toBeLessThan(92);
        expect(row.cells.at(-1), row.month).toBe("Within the laws");
      }
    }
  });

  it("shows the heat pump's COP between 2 and 4.5, within the Carnot limit every month", async () => {
    const rows = monthRows(await plantPage(SITE.housing));
    expect(rows.length).toBeGreaterThanOrEqual(12);
    for (const row of rows) {
      const cop = Number(row.cells[3]);
      expect(cop, row.month).toBeGreaterThan(2);
      expect(cop, row.month).toBeLessThan(4.5);
      expect(row.cells.at(-1), row.month).toBe("Within the laws");
    }
  });

  it("shows the fuel cell near 45 % electrical on the gross basis, below hydrogen's 83.0 % limit", async () => {
    const rows = monthRows(await plantPage(SITE.pool));
    expect(rows.length).toBeGreaterThanOrEqual(12);
    for (const row of rows) {
      const electrical = percent(row.cells[4]);
      expect(electrical, row.month).toBeGreaterThan(40);
      expect(electrical, row.month).toBeLessThan(50);
      expect(row.cells.at(-1), row.month).toBe("Within the laws");
    }
  });

  it("keeps the plant's output meters out of delivered heat: the depot's ledger heat is its steam site's none", async () => {
    const response = await owner.get(
      `/api/v1/orgs/${larchmere}/ledger?from=2026-02&to=2026-02`,
    );
    expect(response.status).toBe(200);
    const body = (await response.json()) as {
      rows: { site_name: string; carrier: string }[];
    };
    const depot = body.rows.filter((r) => r.site_name === SITE.depot);
    expect(depot.map((r) => r.carrier).sort()).toEqual([
      "electricity",
      "natural_gas",
      "steam",
    ]);
  });
});
