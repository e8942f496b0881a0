import { Card } from "~/components/ui";
import { dateTimeIn, decimalAsTyped } from "~/lib/format";

/**
 * When the meter last sent a reading and, for a register, the value it
 * read: what a person needs to continue the series by hand (the value as
 * read, before the meter's multiplier). Times in the site's zone.
 */
export function MeterLastReading({
  last,
  timeZone,
  registerUnit = "kWh",
}: {
  last: {
    at: string | null;
    registerKwh: string | null;
    registerAt: string | null;
  };
  timeZone: string;
  /** What the register counts: kWh, or a gas register's m³ or hcf. */
  registerUnit?: string;
}) {
  const facts: [string, string][] = [
    [
      "Last reading",
      last.at ? dateTimeIn(last.at, timeZone) : "No readings yet",
    ],
  ];
  if (last.registerKwh !== null && last.registerAt)
    facts.push(
      [
        "Last register value",
        `${decimalAsTyped(last.registerKwh)} ${registerUnit}`,
      ],
      ["Read at", dateTimeIn(last.registerAt, timeZone)],
    );
  return (
    <Card aria-label="Last reading">
      <dl className="grid gap-3 sm:grid-cols-3" data-last-reading>
        {facts.map(([term, value]) => (
          <div key={term}>
            <dt className="text-sm text-ink-muted">{term}</dt>
            <dd className="font-semibold tabular-nums">{value}</dd>
          </div>
        ))}
      </dl>
      <p className="mt-2 text-sm text-ink-muted">
        Times in the site&apos;s time zone ({timeZone}); the register value is
        as read, before the meter&apos;s multiplier.
      </p>
    </Card>
  );
}
