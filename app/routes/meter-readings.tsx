import { useEffect, useMemo, useState } from "react";
import { data, Link, useNavigation } from "react-router";
import { idParam, notFound } from "~/auth/membership.server";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { CarpetPlot } from "~/components/readings/carpet-plot";
import { FetchError } from "~/components/filters";
import { EditPanel } from "~/components/readings/edit-panel";
import { newestReadingsStatus } from "~/components/readings/freshness";
import { IntervalGrid } from "~/components/readings/interval-grid";
import { IntervalSummary } from "~/components/readings/interval-summary";
import { LoadProfile } from "~/components/readings/load-profile";
import { hourlyTotals } from "~/components/readings/hourly-totals";
import { useIntervals } from "~/components/readings/use-intervals";
import { SectionCard } from "~/components/section-card";
import { Card, EmptyState, Field, PageHeader } from "~/components/ui";
import { correctionHint } from "~/ingest/correction-rules";
import { editInterval } from "~/ingest/edit-interval.server";
import { editSchema, type EditAnswer } from "~/ingest/interval-edit-form";
import { parseForm } from "~/lib/forms";
import { monthRange } from "~/lib/months";
import { useHydrated } from "~/lib/use-hydrated";
import { getMeter } from "~/sites/meters.server";
import type { Route } from "./+types/meter-readings";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: `Readings ${loaderData?.meter.code ?? ""} · Joulebook` },
];

export async function loader({ params, context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context, "readings.view");
  const meter = await getMeter({
    organizationId: organization.id,
    meterId: idParam(params.meterId, "No such meter."),
  });
  if (!meter) notFound("No such meter.");
  return {
    organization,
    meter: {
      id: meter.id,
      code: meter.code,
      name: meter.name,
      siteId: meter.siteId,
      siteName: meter.siteName,
      timeZone: meter.timeZone,
      carrier: meter.carrier,
      orientation: meter.orientation,
      intervalMinutes: meter.intervalMinutes,
    },
    canEdit: can(role, "readings.edit"),
  };
}

const refusal = (answer: Partial<EditAnswer>) =>
  data<EditAnswer>(
    { errors: {}, saved: null, confirm: null, ...answer },
    { status: 400 },
  );

export async function action({ request, params, context }: Route.ActionArgs) {
  const { organization, user } = requirePermission(context, "readings.edit");
  const meter = await getMeter({
    organizationId: organization.id,
    meterId: idParam(params.meterId, "No such meter."),
  });
  if (!meter) notFound("No such meter.");
  const form = parseForm(await request.formData(), editSchema);
  if (!form.ok) return refusal({ errors: form.errors });
  const { intervalStart, energyKwh, reason, confirmSpike } = form.data;
  const edit = await editInterval({
    organizationId: organization.id,
    actorUserId: user.id,
    meter: { ...meter, spikeFactor: Number(meter.spikeFactor) },
    intervalStart: new Date(intervalStart),
    energyKwh,
    reason,
    confirmedSpike:
      confirmSpike !== undefined && Number(confirmSpike) === energyKwh,
  });
  if (!edit.ok)
    return refusal({
      errors: { [edit.field]: edit.reason },
      confirm: edit.jump
        ? { intervalStart, energyKwh: String(energyKwh) }
        : null,
    });
  return data<EditAnswer>({
    errors: {},
    saved: { intervalStart, flags: edit.flags },
    confirm: null,
  });
}

/** What the page's intervals are, by the meter's resolution. */
const intervalsWord: Record<number, string> = {
  15: "15-minute intervals",
  30: "Half-hourly intervals",
  60: "Hourly intervals",
};

export default function MeterReadings({ loaderData }: Route.ComponentProps) {
  const { meter, organization, canEdit } = loaderData;
  const [month, setMonth] = useState("");
  const range = useMemo(() => monthRange(month), [month]);
  const { page, error, loading, updatedAt, reload } = useIntervals(
    organization.id,
    meter.id,
    range,
  );
  // The hour, not the row: after a correction the grid's data is fetched
  // again, and the panel must show the new row, not the one clicked.
  const [selectedHour, setSelectedHour] = useState<string | null>(null);
  // Charts and the grid measure the page, so they render in the browser only.
  const mounted = useHydrated();
  const navigation = useNavigation();
  // After a correction is saved, fetch the hour again so the table shows it.
  useEffect(() => {
    if (navigation.state === "idle" && mounted) void reload();
  }, [navigation.state, mounted, reload]);
  const intervals = page?.intervals ?? [];
  const selected = intervals.find((i) => i.start === selectedHour) ?? null;
  // The charts read in hours; the table keeps the meter's own intervals.
  const hours = useMemo(() => hourlyTotals(page?.intervals ?? []), [page]);
  return (
    <>
      <PageHeader
        title={`${meter.code} · ${meter.name}`}
        description={
          <>
            {intervalsWord[meter.intervalMinutes] ?? "Intervals"} at{" "}
            <Link
              className="font-semibold text-spruce-700 underline"
              to={`/o/${organization.id}/sites/${meter.siteId}`}
            >
              {meter.siteName}
            </Link>
            , in the site's time zone ({meter.timeZone}).
          </>
        }
      />
      <div className="flex flex-col gap-6">
        <Card>
          <div className="flex flex-wrap items-end justify-between gap-4">
            <Field
              label="Month"
              name="month"
              type="month"
              value={month}
              onChange={(e) => setMonth(e.target.value)}
              hint="Empty: the newest week, refreshed as readings arrive"
            />
            <p className="text-sm text-ink-muted" role="status">
              {loading
                ? "Loading…"
                : updatedAt
                  ? `${range ? "Range" : newestReadingsStatus(page?.latest ?? null, updatedAt, meter.timeZone).text} · updated ${updatedAt.toLocaleTimeString("en-GB")}`
                  : ""}
            </p>
          </div>
          <FetchError error={error} />
          {page && intervals.length > 0 ? (
            <div className="mt-4">
              <IntervalSummary intervals={intervals} meter={meter} />
            </div>
          ) : null}
        </Card>
        {!loading && intervals.length === 0 && !error ? (
          <EmptyState title="No intervals in this range">
            Readings posted by a gateway or uploaded as CSV appear here within
            seconds.
          </EmptyState>
        ) : null}
        {mounted && intervals.length > 0 ? (
          <>
            <SectionCard headingId="profile-heading" title="Load profile">
              <LoadProfile
                intervals={hours}
                timeZone={meter.timeZone}
                carrier={meter.carrier}
              />
            </SectionCard>
            <SectionCard headingId="carpet-heading" title="Carpet plot">
              <p className="text-sm text-ink-muted">
                Each row a day, each column an hour; darker is more energy.
                Outlined cells are estimated or corrected.
              </p>
              <CarpetPlot
                intervals={hours}
                timeZone={meter.timeZone}
                carrier={meter.carrier}
              />
            </SectionCard>
            <SectionCard headingId="grid-heading" title="Intervals">
              <IntervalGrid
                intervals={intervals}
                timeZone={meter.timeZone}
                onSelect={(row) => setSelectedHour(row?.start ?? null)}
              />
            </SectionCard>
            {canEdit ? (
              <SectionCard headingId="edit-heading" title="Correct an interval">
                <div className="mt-3">
                  <EditPanel
                    selected={selected}
                    timeZone={meter.timeZone}
                    hint={correctionHint(meter)}
                  />
                </div>
              </SectionCard>
            ) : null}
          </>
        ) : null}
      </div>
    </>
  );
}
