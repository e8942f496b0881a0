import type { PoolClient } from "pg";

// Raw SQL, on purpose: the partition check every batch makes, measured by `npm run bench readings`.
// Each query is typed at its edge by the row shape it names (docs/architecture.md, "Data access").

/**
 * Makes sure the interval tables (raw_readings, intervals, interval_exergy,
 * gas_interval_volumes) have their monthly partitions for
 * [from, to]. ensure_month_partitions serialises on one advisory lock that is
 * held until the caller's commit, so it is called only when a partition is
 * actually missing: otherwise every batch would wait for every other one.
 * The names are the ones the function gives (`<table>_YYYY_MM`, UTC months).
 */
export async function ensurePartitions(
  client: PoolClient,
  from: Date,
  to: Date,
): Promise<void> {
  await client.query({
    name: "ingest_ensure_partitions",
    text: `select ensure_month_partitions($1, $2)
      where exists (
        select 1
          from generate_series(date_trunc('month', $1::timestamptz, 'UTC'), $2::timestamptz, interval '1 month') as m,
               lateral (select to_char(m at time zone 'UTC', 'YYYY_MM') as suffix) as n
         where to_regclass('raw_readings_' || n.suffix) is null
            or to_regclass('intervals_' || n.suffix) is null
            or to_regclass('interval_exergy_' || n.suffix) is null
            or to_regclass('gas_interval_volumes_' || n.suffix) is null)`,
    values: [from, to],
  });
}
