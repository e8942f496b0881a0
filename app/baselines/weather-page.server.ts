/**
 * What the Weather & baselines page shows of one site: its weather, its
 * saved baselines, and the analysis the page's query asks for (carrier,
 * degree days, periods, or a saved baseline to reckon savings against).
 */
import { isUuid } from "~/lib/ids";
import type { getSite } from "~/sites/sites.server";
import { analyseSite, siteDefaults } from "./analysis.server";
import { getBaseline, listBaselines } from "./baselines.server";
import { isCarrier } from "~/sites/meter-kinds";
import { defaultDriver, isDriver, periodErrors } from "./periods";
import { weatherCoverage } from "./weather.server";

type Site = NonNullable<Awaited<ReturnType<typeof getSite>>>;

export async function weatherPageView({
  organizationId,
  site,
  query,
}: {
  organizationId: string;
  /** A site of this organisation. */
  site: Site;
  query: URLSearchParams;
}) {
  const q = (name: string) => query.get(name);
  const requested = q("carrier");
  const defaults = await siteDefaults({
    organizationId,
    siteId: site.id,
    carrier: isCarrier(requested) ? requested : null,
    now: new Date(),
  });
  const carrier = defaults.carrier;
  const [coverage, savedList] = await Promise.all([
    weatherCoverage({ organizationId, siteId: site.id }),
    carrier
      ? listBaselines({ organizationId, siteId: site.id, carrier })
      : Promise.resolve([]),
  ]);
  const periods = {
    baseFrom: q("baseFrom") || defaults.periods.baseFrom,
    baseTo: q("baseTo") || defaults.periods.baseTo,
    reportFrom: q("reportFrom") || defaults.periods.reportFrom,
    reportTo: q("reportTo") || defaults.periods.reportTo,
  };
  const errors = {
    ...periodErrors(periods.baseFrom, periods.baseTo, ["baseFrom", "baseTo"]),
    ...periodErrors(periods.reportFrom, periods.reportTo, [
      "reportFrom",
      "reportTo",
    ]),
  };
  const requestedDriver = q("driver");
  const driver = isDriver(requestedDriver)
    ? requestedDriver
    : carrier
      ? defaultDriver(carrier)
      : "hdd";
  const baselineParam = q("baseline") ?? "";
  // A saved baseline of another site or carrier is not applied here.
  const saved =
    carrier && isUuid(baselineParam)
      ? await getBaseline({ organizationId, id: baselineParam })
      : null;
  const applied =
    saved && saved.siteId === site.id && saved.carrier === carrier
      ? saved
      : null;
  const analysis =
    carrier && Object.keys(errors).length === 0
      ? await analyseSite({
          organizationId,
          site,
          carrier,
          driver,
          periods,
          saved: applied,
        })
      : null;
  return {
    coverage,
    savedList,
    view: {
      site: {
        id: site.id,
        name: site.name,
        timeZone: site.timeZone,
        degreeDayBaseC: Number(site.degreeDayBaseC),
        floorAreaM2:
          site.floorAreaM2 === null ? null : Number(site.floorAreaM2),
      },
      carriers: defaults.carriers,
      carrier,
      driver: applied ? applied.model.driver : driver,
      periods,
      errors,
      saved: applied,
      analysis,
    },
  };
}

export type WeatherPageView = Awaited<ReturnType<typeof weatherPageView>>;
/** The site, carrier and periods shown, and their analysis. */
export type SiteView = WeatherPageView["view"];
export type AnalysisView = NonNullable<SiteView["analysis"]>;
