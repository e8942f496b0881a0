/**
 * The route table's entries for sites and meters (provisioning.server.ts):
 * reads for every member, writes for the roles that manage sites, as on the
 * pages. Spread into routes.server.ts.
 */
import {
  errorReply,
  jsonReply,
  member,
  type ApiRoute,
} from "./api-route.server";
import {
  getMeters,
  getOneMeter,
  getOneSite,
  getSites,
  patchMeter,
  patchSite,
  postMeter,
  postMeterArchive,
  postSite,
  postSiteArchive,
} from "./provisioning.server";
import {
  meterArchiveBodySchema,
  meterCreateBodySchema,
  meterListQuerySchema,
  meterListSchema,
  meterPathSchema,
  meterSchema,
  meterUpdateBodySchema,
  orgPathSchema,
  siteCreateBodySchema,
  siteListSchema,
  sitePathSchema,
  siteSchema,
  siteUpdateBodySchema,
} from "./schemas";

const BODY_LIMIT = "10kb";
const read = member("organization.view");
const write = member("sites.manage");
const refused = errorReply("The role may not manage sites and meters");
const badSite = errorReply(
  "Not valid: the issues name the fields, in the Sites page's words",
);
const badMeter = errorReply(
  "Not valid: the issues name the fields, in the meter page's words (interval_minutes is 15, 30 or 60)",
);

const siteExample = {
  name: "North campus",
  time_zone: "Europe/London",
  floor_area_m2: 12500,
};
const meterExample = {
  site_id: "8f1d2c3b-4a5e-4f60-8a7b-9c0d1e2f3a4b",
  code: "EM-12",
  name: "Main incomer",
  quantity: "electric_register",
  carrier: "electricity",
  orientation: "import",
  interval_minutes: 30,
  installed_at: "2026-01-01",
};

export function provisioningRoutes(): ApiRoute[] {
  return [
    {
      method: "get",
      path: "/orgs/:orgId/sites",
      summary: "The sites in use (archived ones left out), by name",
      access: read,
      params: orgPathSchema,
      handler: getSites,
      responses: { 200: jsonReply("`{ sites: [...] }`", siteListSchema) },
    },
    {
      method: "post",
      path: "/orgs/:orgId/sites",
      summary: "Add a site (owners and energy managers)",
      description:
        "The Sites page's rules: a name of 1–120 characters not used by another site here (409), a time zone this server knows, a floor area from 0.01 m². Recorded in the audit trail.",
      access: write,
      params: orgPathSchema,
      body: {
        kind: "json",
        limit: BODY_LIMIT,
        schema: siteCreateBodySchema,
        example: siteExample,
      },
      handler: postSite,
      responses: {
        201: jsonReply("The new site", siteSchema),
        400: badSite,
        403: refused,
        409: errorReply("Another site here has this name"),
      },
    },
    {
      method: "get",
      path: "/orgs/:orgId/sites/:siteId",
      summary: "One site, archived or not",
      access: read,
      params: sitePathSchema,
      handler: getOneSite,
      responses: {
        200: jsonReply("The site", siteSchema),
        404: errorReply("No such site here"),
      },
    },
    {
      method: "patch",
      path: "/orgs/:orgId/sites/:siteId",
      summary: "Change a site's details (the fields sent)",
      access: write,
      params: sitePathSchema,
      body: {
        kind: "json",
        limit: BODY_LIMIT,
        schema: siteUpdateBodySchema,
        example: { floor_area_m2: 13100 },
      },
      handler: patchSite,
      responses: {
        200: jsonReply("The site as stored", siteSchema),
        400: badSite,
        403: refused,
        404: errorReply("No such site here"),
        409: errorReply("Another site here has this name"),
      },
    },
    {
      method: "post",
      path: "/orgs/:orgId/sites/:siteId/archive",
      summary: "Archive a site: out of the lists and the bill, history kept",
      description: "Archiving an archived site changes nothing.",
      access: write,
      params: sitePathSchema,
      handler: postSiteArchive,
      responses: {
        200: jsonReply("The site, with archived_at", siteSchema),
        403: refused,
        404: errorReply("No such site here"),
      },
    },
    {
      method: "get",
      path: "/orgs/:orgId/meters",
      summary: "The meters, retired ones included (removed_at set)",
      access: read,
      params: orgPathSchema,
      query: meterListQuerySchema,
      handler: getMeters,
      responses: {
        200: jsonReply("`{ meters: [...] }`", meterListSchema),
        400: errorReply("A site_id that is not an id"),
      },
    },
    {
      method: "post",
      path: "/orgs/:orgId/meters",
      summary: "Add a meter to a site (owners and energy managers)",
      description:
        "The meter page's rules: a code unique in the organisation (409), a carrier that fits the quantity, the EN 1434 band whole or not at all, the sensor pipe for water heat meters, a parent on the same site. interval_minutes 15, 30 or 60 (the default). Recorded in the audit trail.",
      access: write,
      params: orgPathSchema,
      body: {
        kind: "json",
        limit: BODY_LIMIT,
        schema: meterCreateBodySchema,
        example: meterExample,
      },
      handler: postMeter,
      responses: {
        201: jsonReply("The new meter", meterSchema),
        400: badMeter,
        403: refused,
        409: errorReply("Another meter in this organisation uses this code"),
      },
    },
    {
      method: "get",
      path: "/orgs/:orgId/meters/:meterId",
      summary: "One meter",
      access: read,
      params: meterPathSchema,
      handler: getOneMeter,
      responses: {
        200: jsonReply("The meter", meterSchema),
        404: errorReply("No such meter here"),
      },
    },
    {
      method: "patch",
      path: "/orgs/:orgId/meters/:meterId",
      summary: "Change a meter's settings (the fields sent; not its site)",
      description:
        "interval_minutes can change only while the meter has no intervals; after that the change is refused with 409 `resolution_fixed`.",
      access: write,
      params: meterPathSchema,
      body: {
        kind: "json",
        limit: BODY_LIMIT,
        schema: meterUpdateBodySchema,
        example: { name: "Main incomer (LV board 1)" },
      },
      handler: patchMeter,
      responses: {
        200: jsonReply("The meter as stored", meterSchema),
        400: badMeter,
        403: refused,
        404: errorReply("No such meter here"),
        409: errorReply(
          "Another meter in this organisation uses this code, or a change of interval_minutes on a meter that already has intervals (`resolution_fixed`)",
        ),
      },
    },
    {
      method: "post",
      path: "/orgs/:orgId/meters/:meterId/archive",
      summary: "Retire a meter: readings after removed_at are refused",
      access: write,
      params: meterPathSchema,
      body: {
        kind: "json",
        limit: BODY_LIMIT,
        schema: meterArchiveBodySchema,
        example: { removed_at: "2026-12-01", reason: "Board replaced" },
      },
      handler: postMeterArchive,
      responses: {
        200: jsonReply("The meter, with removed_at", meterSchema),
        400: errorReply("A bad date or reason"),
        403: refused,
        404: errorReply("No such meter here"),
        409: errorReply("The meter is retired already"),
      },
    },
  ];
}
