import {
  type RouteConfig,
  index,
  layout,
  route,
} from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),
  route("sign-in", "routes/sign-in.tsx"),
  route("sign-out", "routes/sign-out.tsx"),
  route("forgot-password", "routes/forgot-password.tsx"),
  route("reset-password/:token", "routes/reset-password.tsx"),
  route("invitations/:token", "routes/accept-invitation.tsx"),
  layout("routes/app-layout.tsx", [
    route("account", "routes/account.tsx"),
    route("outbox", "routes/outbox.tsx"),
    route("o/:orgId", "routes/org-layout.tsx", [
      index("routes/org-home.tsx"),
      route("overview", "routes/overview.tsx"),
      route("members", "routes/members.tsx"),
      route("sites", "routes/sites.tsx"),
      route("sites/:siteId", "routes/site.tsx"),
      route("sites/:siteId/meters/new", "routes/meter-new.tsx"),
      route("meters/:meterId", "routes/meter.tsx"),
      route("meters/:meterId/readings", "routes/meter-readings.tsx"),
      route("readings", "routes/readings.tsx"),
      route("ledger", "routes/ledger.tsx"),
      route("weather", "routes/weather-baselines.tsx"),
      route("gateways", "routes/gateways.tsx"),
    ]),
  ]),
  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
