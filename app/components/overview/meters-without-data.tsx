import { Link } from "react-router";
import type { SilentMeter } from "~/overview/estate-overview.server";
import { SectionCard } from "~/components/section-card";
import { EmptyState } from "~/components/ui";
import { timeAgo } from "~/lib/format";

/** Meters with no actual reading for more than `hours`, each linked to its readings. */
export function MetersWithoutData({
  meters,
  hours,
  now,
  base,
}: {
  meters: SilentMeter[];
  hours: number;
  /** The loader's clock (ISO), so server and browser write the same ages. */
  now: string;
  /** The organisation's pages, `/o/<id>`. */
  base: string;
}) {
  const other = hours === 24 ? 72 : 24;
  return (
    <SectionCard headingId="silent-heading" title="Meters with no data">
      <p className="text-sm text-ink-muted">
        No actual reading for more than {hours} hours.{" "}
        <Link className="underline" to={`?silent=${other}`}>
          Show over {other} h
        </Link>
      </p>
      {meters.length === 0 ? (
        <div className="mt-3">
          <EmptyState title="Every meter is reporting" />
        </div>
      ) : (
        <ul className="mt-2 divide-y divide-line">
          {meters.map((m) => (
            <li
              key={m.meter_id}
              className="flex items-center justify-between gap-3 py-2"
            >
              <Link
                className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
                to={`${base}/meters/${m.meter_id}/readings`}
              >
                <span className="font-mono">{m.code}</span> {m.name}
                <span className="block text-sm font-normal text-ink-muted">
                  {m.site_name}
                </span>
              </Link>
              <span className="text-sm text-ink-muted">
                {m.last_hour ? `last ${timeAgo(m.last_hour, now)}` : "never"}
              </span>
            </li>
          ))}
        </ul>
      )}
    </SectionCard>
  );
}
