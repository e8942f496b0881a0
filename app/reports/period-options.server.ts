import { monthsBetween } from "~/baselines/degree-days";
import { pool } from "~/db/client.server";
import { monthLong } from "~/lib/format";
import { anchorFor } from "./periods";

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
  const quarters = [...new Set(months.map((m) => anchorFor("quarter", m)))];
  const years = [...new Set(months.map((m) => anchorFor("year", m)))];
  return {
    months: months.map((m) => ({
      value: `month:${m}`,
      label: monthLong(m),
    })),
    quarters: quarters.map((q) => ({
      value: `quarter:${q}`,
      label: q.replace("-", " "),
    })),
    years: years.map((y) => ({ value: `year:${y}`, label: y })),
    suggested: months[1] ? `month:${months[1]}` : `month:${months[0]}`,
  };
}
