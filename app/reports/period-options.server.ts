import { pool } from "~/db/client.server";

export interface PeriodOption {
  /** "month:2026-03", "quarter:2026-Q1" or "year:2026", as the form sends it */
  value: string;
  label: string;
}

export interface PeriodChoices {
  months: PeriodOption[];
  quarters: PeriodOption[];
  years: PeriodOption[];
  /** The latest whole month with data: the sensible default. */
  suggested: string | null;
}

const monthFormat = new Intl.DateTimeFormat("en-GB", {
  month: "long",
  year: "numeric",
  timeZone: "UTC",
});

/**
 * The periods worth offering: every month, quarter and year from the first
 * month with ledger data to the last, newest first.
 */
export async function periodChoices(
  organizationId: string,
): Promise<PeriodChoices> {
  const { rows } = await pool.query<{
    first: string | null;
    last: string | null;
  }>(
    `select to_char(min(month), 'YYYY-MM') as first,
            to_char(max(month), 'YYYY-MM') as last
       from monthly_rollups where organization_id = $1`,
    [organizationId],
  );
  const { first, last } = rows[0] ?? {};
  if (!first || !last)
    return { months: [], quarters: [], years: [], suggested: null };
  const months = monthsBetween(first, last).reverse();
  const quarters = [...new Set(months.map(quarterOf))];
  const years = [...new Set(months.map((m) => m.slice(0, 4)))];
  return {
    months: months.map((m) => ({
      value: `month:${m}`,
      label: monthFormat.format(new Date(`${m}-01T00:00:00Z`)),
    })),
    quarters: quarters.map((q) => ({
      value: `quarter:${q}`,
      label: q.replace("-", " "),
    })),
    years: years.map((y) => ({ value: `year:${y}`, label: y })),
    suggested: months[1] ? `month:${months[1]}` : `month:${months[0]}`,
  };
}

function quarterOf(month: string): string {
  return `${month.slice(0, 4)}-Q${Math.ceil(Number(month.slice(5, 7)) / 3)}`;
}

function monthsBetween(first: string, last: string): string[] {
  const out: string[] = [];
  let [y, m] = first.split("-").map(Number);
  const [ly, lm] = last.split("-").map(Number);
  while (y < ly || (y === ly && m <= lm)) {
    out.push(`${y}-${String(m).padStart(2, "0")}`);
    m += 1;
    if (m === 13) {
      m = 1;
      y += 1;
    }
  }
  return out;
}
