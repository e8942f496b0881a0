import type { Config } from "@react-router/dev/config";

// v8_viteEnvironmentApi stays off: the SSR build takes app/app.server.ts as
// its input through vite's `isSsrBuild`, so the Express API and the route
// modules share one bundle (and one database pool) in production.
export default {
  ssr: true,
  future: {
    v8_middleware: true,
    v8_splitRouteModules: true,
    v8_passThroughRequests: true,
    v8_trailingSlashAwareDataRequests: true,
  },
} satisfies Config;
