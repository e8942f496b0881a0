/**
 * The process: validates the environment, prepares the job queue, then
 * either serves (one process) or, with WEB_CONCURRENCY above 1 in
 * production, becomes the primary of that many server processes
 * (app/processes/primary.server.ts). A server process sets security
 * headers, serves the built assets (or Vite in development), mounts the
 * Express app from app/app.server.ts, takes queue jobs, and shuts down
 * cleanly on SIGTERM.
 */
import cluster from "node:cluster";
import { createServer } from "node:http";
import path from "node:path";
import { pathToFileURL } from "node:url";
import compression from "compression";
import express, {
  type NextFunction,
  type Request,
  type Response,
} from "express";
import helmet from "helmet";
import { parseEnv, serverProcessCount, type Env } from "./app/env.server";
import { startSupervisor, type Supervisor } from "./app/jobs/supervisor.server";
import { runPrimary } from "./app/processes/primary.server";

type ExpressApp = (req: Request, res: Response, next: NextFunction) => void;
interface AppModule {
  app: ExpressApp;
  startBackgroundWork: () => Promise<void>;
  closeResources: () => Promise<void>;
}

function loadEnv(): Env {
  try {
    return parseEnv(process.env);
  } catch (error) {
    console.error((error as Error).message);
    process.exit(1);
  }
}

const env = loadEnv();
const development = env.NODE_ENV === "development";
// Vite's dev server and its reloading belong to one process.
const processes = development ? 1 : serverProcessCount(env);

/**
 * The queue's schema, queues and schedules, made once per machine before any
 * process takes a job (the database's own migrations ran before, in
 * npm start's script).
 */
function superviseQueue(): Promise<Supervisor> {
  return startSupervisor({
    databaseUrl: env.DATABASE_URL,
    schema: env.JOB_QUEUE_SCHEMA,
    alertsMinutes: env.ALERTS_INTERVAL_MINUTES,
    reconcileMinutes: env.BILLING_RECONCILE_MINUTES,
  });
}

if (cluster.isPrimary && processes > 1) {
  runPrimary({ processes, supervisor: await superviseQueue() });
} else {
  await serve(cluster.isPrimary ? await superviseQueue() : null);
}

async function serve(supervisor: Supervisor | null): Promise<void> {
  // The billing page's forms redirect to Stripe's Checkout and billing portal
  // (or to the local fake's pages); CSP checks form redirects too.
  const stripeFormTargets = env.STRIPE_API_BASE
    ? [new URL(env.STRIPE_API_BASE).origin]
    : ["https://checkout.stripe.com", "https://billing.stripe.com"];
  const app = express();
  const httpServer = createServer(app);

  app.disable("x-powered-by");
  if (env.TRUST_PROXY === "1") app.set("trust proxy", 1);

  app.use(
    helmet({
      // Vite's dev client injects inline modules and a websocket; the built app
      // gets a policy that allows nothing from another origin.
      contentSecurityPolicy: development
        ? false
        : {
            useDefaults: false,
            directives: {
              defaultSrc: ["'self'"],
              // React Router inlines its hydration data and module loader.
              scriptSrc: ["'self'", "'unsafe-inline'"],
              styleSrc: ["'self'", "'unsafe-inline'"],
              imgSrc: ["'self'", "data:", "blob:"],
              fontSrc: ["'self'"],
              connectSrc: ["'self'"],
              frameAncestors: ["'none'"],
              formAction: ["'self'", ...stripeFormTargets],
              baseUri: ["'self'"],
              objectSrc: ["'none'"],
            },
          },
      hsts: false,
    }),
  );
  app.use(compression());

  /** The host of an Origin header, or null when it is not a URL (`Origin: x`). */
  function originHost(origin: string): string | null {
    return URL.canParse(origin) ? new URL(origin).host : null;
  }

  // Cross-site form posts are refused: a state-changing request from a browser
  // must come from this origin (SameSite=Lax cookies are the second guard).
  app.use((req, res, next) => {
    if (["GET", "HEAD", "OPTIONS"].includes(req.method)) return next();
    const origin = req.get("origin");
    if (!origin || origin === "null") return next();
    const host = originHost(origin);
    if (host === null) {
      res
        .status(403)
        .type("text/plain")
        .send("Request refused: the Origin header is not a URL.");
      return;
    }
    if (host !== req.get("host")) {
      res.status(403).type("text/plain").send("Cross-origin request refused.");
      return;
    }
    next();
  });

  type Mounted = Omit<AppModule, "app">;

  async function mountDevelopment(): Promise<Mounted> {
    const vite = await import("vite");
    const viteServer = await vite.createServer({
      server: { middlewareMode: true, ws: { server: httpServer } },
    });
    const load = async () =>
      (await viteServer.ssrLoadModule("./app/app.server.ts")) as AppModule;
    app.use(viteServer.middlewares);
    app.use(async (req, res, next) => {
      try {
        const mod = await load();
        mod.app(req, res, next);
      } catch (error) {
        if (error instanceof Error) viteServer.ssrFixStacktrace(error);
        next(error);
      }
    });
    // The queue's handlers are those of the first load: a reload of their
    // modules takes effect for jobs after a restart.
    const first = await load();
    return {
      startBackgroundWork: first.startBackgroundWork,
      closeResources: async () => {},
    };
  }

  async function mountProduction(): Promise<Mounted> {
    const buildDir = path.resolve("build");
    app.use(
      "/assets",
      express.static(path.join(buildDir, "client/assets"), {
        immutable: true,
        maxAge: "1y",
      }),
    );
    app.use(express.static(path.join(buildDir, "client"), { maxAge: "1h" }));
    // A runtime path, so typechecking server.ts does not need a build.
    const entry = pathToFileURL(path.join(buildDir, "server/index.js")).href;
    const mod = (await import(entry)) as AppModule;
    app.use(mod.app);
    return mod;
  }

  const { startBackgroundWork, closeResources } = development
    ? await mountDevelopment()
    : await mountProduction();
  await startBackgroundWork();

  httpServer.listen(env.PORT, env.HOST, () => {
    console.log(
      `[joulebook] serving on http://${env.HOST}:${env.PORT} (${env.NODE_ENV})`,
    );
  });

  function shutdown(signal: string) {
    console.log(`[joulebook] ${signal}: closing`);
    httpServer.close(() => {
      closeResources()
        .then(() => supervisor?.stop())
        .finally(() => process.exit(0));
    });
    httpServer.closeIdleConnections();
    setTimeout(() => process.exit(0), 5000).unref();
  }
  process.on("SIGTERM", () => shutdown("SIGTERM"));
  process.on("SIGINT", () => shutdown("SIGINT"));
}
