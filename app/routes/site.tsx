import { data, Form, Link } from "react-router";
import { idParam, notFound } from "~/auth/membership.server";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { Boundary, flowLabel } from "~/components/boundary";
import { CarrierBadge } from "~/components/carrier-badge";
import { Cautions } from "~/components/cautions";
import { SiteBalanceView } from "~/components/site-balance";
import { SiteFields } from "~/components/site-fields";
import {
  Badge,
  Button,
  buttonClass,
  Card,
  EmptyState,
  Notice,
  PageHeader,
} from "~/components/ui";
import {
  balanceMonths,
  MONTH_PATTERN,
  siteBalance,
} from "~/ledger/site-balance.server";
import { deliveredSign } from "~/ledger/delivered";
import { formatArea, formatCelsius } from "~/lib/format";
import { parseForm } from "~/lib/forms";
import { siteEnergySince } from "~/sites/meter-energy.server";
import { listSiteMeters } from "~/sites/meters.server";
import { carrierLabels } from "~/sites/meter-kinds";
import { plantMonthOfSite } from "~/plant/plant-month.server";
import { siteExergyOfMonth } from "~/exergy/site-exergy.server";
import { siteFormSchema } from "~/sites/site-schema";
import { DuplicateNameError, getSite, updateSite } from "~/sites/sites.server";
import type { Route } from "./+types/site";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: `${loaderData?.site.name ?? "Site"} · Joulebook` },
];

const THIRTY_DAYS_MS = 30 * 86_400_000;

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context);
  const site = await getSite({
    organizationId: organization.id,
    siteId: idParam(params.siteId, "No such site."),
  });
  if (!site) notFound("No such site.");
  const [meters, energy, months] = await Promise.all([
    listSiteMeters({ organizationId: organization.id, siteId: site.id }),
    siteEnergySince({
      organizationId: organization.id,
      siteId: site.id,
      since: new Date(Date.now() - THIRTY_DAYS_MS),
    }),
    balanceMonths({ organizationId: organization.id, siteId: site.id }),
  ]);
  // The energy balance of ?month=YYYY-MM, else of the newest month with data.
  const asked = new URL(request.url).searchParams.get("month") ?? "";
  const month = MONTH_PATTERN.test(asked) ? asked : (months[0] ?? null);
  const scope = { organizationId: organization.id, siteId: site.id };
  const [balance, plant, exergy] = month
    ? await Promise.all([
        siteBalance({ ...scope, month }),
        plantMonthOfSite({ ...scope, month }),
        siteExergyOfMonth({ ...scope, month }),
      ])
    : [null, { flows: [], losses: [] }, []];
  return {
    organization,
    site,
    meters: meters.map((m) => ({
      ...m,
      energyKwh30d: energy.get(m.id) ?? null,
    })),
    canManage: can(role, "sites.manage"),
    balance,
    plantLosses: plant.losses,
    plantFlows: plant.flows,
    exergy,
    balanceMonths: months,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { organization, user } = requirePermission(context, "sites.manage");
  const siteId = idParam(params.siteId, "No such site.");
  const form = parseForm(await request.formData(), siteFormSchema);
  if (!form.ok)
    return data({ errors: form.errors, saved: false }, { status: 400 });
  const { intent: _intent, ...input } = form.data;
  try {
    const saved = await updateSite({
      organizationId: organization.id,
      actorUserId: user.id,
      siteId,
      input,
    });
    if (!saved) notFound("No such site.");
    return { errors: {} as Record<string, string>, saved: true };
  } catch (error) {
    if (error instanceof DuplicateNameError)
      return data(
        {
          errors: { name: error.message } as Record<string, string>,
          saved: false,
        },
        { status: 409 },
      );
    throw error;
  }
}

export default function Site({ loaderData, actionData }: Route.ComponentProps) {
  const { site, meters, canManage, organization } = loaderData;
  const errors: Record<string, string | undefined> = actionData?.errors ?? {};
  const base = `/o/${organization.id}`;
  return (
    <>
      <PageHeader
        title={site.name}
        description={[
          site.address,
          site.floorAreaM2 ? formatArea(Number(site.floorAreaM2)) : null,
          `degree day base ${formatCelsius(Number(site.degreeDayBaseC))}`,
          site.timeZone,
        ]
          .filter(Boolean)
          .join(" · ")}
        actions={
          <>
            <Link
              to={`${base}/sites/${site.id}/plant`}
              className={buttonClass("secondary")}
            >
              Plant and its checks
            </Link>
            {canManage ? (
              <Link
                to={`${base}/sites/${site.id}/meters/new`}
                className={buttonClass()}
              >
                Add a meter
              </Link>
            ) : null}
          </>
        }
      />
      <div className="flex flex-col gap-6">
        <Card aria-labelledby="boundary-heading">
          <h2 id="boundary-heading" className="text-lg">
            Boundary
          </h2>
          {meters.length === 0 ? (
            <div className="mt-3">
              <EmptyState title="No meters on this boundary yet">
                {canManage
                  ? "Add the first meter to start receiving readings."
                  : "An energy manager adds meters."}
              </EmptyState>
            </div>
          ) : (
            <Boundary
              siteName={site.name}
              orgId={organization.id}
              meters={meters.map((m) => ({
                ...m,
                retired: m.removedAt !== null,
              }))}
            />
          )}
        </Card>
        <Card aria-labelledby="balance-heading">
          <h2 id="balance-heading" className="text-lg">
            Energy balance
          </h2>
          <SiteBalanceView
            balance={loaderData.balance}
            plantLosses={loaderData.plantLosses}
            plantFlows={loaderData.plantFlows}
            exergy={loaderData.exergy}
            months={loaderData.balanceMonths}
            siteName={site.name}
          />
        </Card>
        {meters.length > 0 ? (
          <Card aria-labelledby="meters-heading">
            <h2 id="meters-heading" className="text-lg">
              Meters
            </h2>
            {/* On a phone the table keeps two columns, the meter and its
                figure; code, carrier, orientation and links fold into the
                meter's cell instead of pushing the figure off screen. */}
            <div className="relative mt-3 overflow-x-auto">
              <table className="w-full text-left sm:min-w-[640px]">
                <thead className="text-sm text-ink-muted">
                  <tr>
                    <th className="hidden py-2 pr-3 font-semibold sm:table-cell">
                      Code
                    </th>
                    <th className="py-2 pr-3 font-semibold">
                      <span className="sm:hidden">Meter</span>
                      <span className="hidden sm:inline">Name</span>
                    </th>
                    <th className="hidden py-2 pr-3 font-semibold sm:table-cell">
                      Carrier
                    </th>
                    <th className="hidden py-2 pr-3 font-semibold sm:table-cell">
                      Orientation
                    </th>
                    <th className="py-2 pr-3 text-right font-semibold">
                      Last 30 days (imports +, exports −)
                    </th>
                    <th className="hidden py-2 font-semibold sm:table-cell">
                      <span className="sr-only">Links</span>
                    </th>
                  </tr>
                </thead>
                <tbody className="divide-y divide-line">
                  {meters.map((m) => {
                    const orientation =
                      m.orientation === "import" ? "Import (+)" : "Export (−)";
                    const links = (
                      <>
                        <Link
                          className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
                          to={`${base}/meters/${m.id}/readings`}
                        >
                          Readings
                        </Link>
                        {" · "}
                        <Link
                          className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
                          to={`${base}/meters/${m.id}`}
                        >
                          {canManage ? "Edit" : "Details"}
                        </Link>
                      </>
                    );
                    return (
                      <tr key={m.id} data-meter={m.code}>
                        <td className="hidden py-2 pr-3 font-mono text-sm sm:table-cell">
                          {m.code}
                        </td>
                        <td className="py-2 pr-3">
                          <span className="block font-mono text-sm sm:hidden">
                            {m.code}
                          </span>
                          {m.name}
                          {m.parentMeterId ? (
                            <span className="text-sm text-ink-muted">
                              {" "}
                              (sub-meter)
                            </span>
                          ) : null}
                          {m.position === "internal" ? (
                            <span
                              className="text-sm text-ink-muted"
                              data-inside-boundary
                            >
                              {" "}
                              (inside the boundary)
                            </span>
                          ) : null}
                          {m.removedAt ? (
                            <>
                              {" "}
                              <Badge tone="neutral">retired</Badge>
                            </>
                          ) : null}
                          <span className="block text-sm text-ink-muted sm:hidden">
                            {carrierLabels[m.carrier]} · {orientation}
                          </span>
                          <span className="block text-sm sm:hidden">
                            {links}
                          </span>
                        </td>
                        <td className="hidden py-2 pr-3 sm:table-cell">
                          <CarrierBadge carrier={m.carrier} />
                        </td>
                        <td className="hidden py-2 pr-3 sm:table-cell">
                          {orientation}
                        </td>
                        <td className="py-2 pr-3 text-right align-top tabular-nums whitespace-nowrap sm:align-middle">
                          {flowLabel(
                            m.energyKwh30d === null
                              ? null
                              : deliveredSign(m.carrier) * m.energyKwh30d,
                          )}
                        </td>
                        <td className="hidden py-2 text-right sm:table-cell">
                          {links}
                        </td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
          </Card>
        ) : null}
        {canManage ? (
          <Card aria-labelledby="edit-site-heading">
            <h2 id="edit-site-heading" className="text-lg">
              Site details
            </h2>
            <Form method="post" className="mt-4 flex flex-col gap-4" noValidate>
              {actionData?.saved ? (
                <Notice tone="success">Saved.</Notice>
              ) : null}
              <SiteFields
                errors={errors}
                defaults={{ ...site, address: site.address }}
              />
              <div>
                <Button type="submit">Save site</Button>
              </div>
            </Form>
          </Card>
        ) : null}
        <Cautions />
      </div>
    </>
  );
}
