/** `npm start` runs this on every start: each part goes in only if absent. */
import { drizzle } from "drizzle-orm/node-postgres";
import pg from "pg";
import * as schema from "../app/db/schema";
import { seedDemo } from "./seed-demo";

const url = process.env.DATABASE_URL;
if (!url) {
  console.error("DATABASE_URL is not set");
  process.exit(1);
}
const pool = new pg.Pool({ connectionString: url, max: 2 });
try {
  const created = await seedDemo(
    drizzle(pool, { schema }),
    process.env.DEMO_GATEWAY_KEY || undefined,
  );
  console.log(
    created
      ? "[joulebook] demo people seeded"
      : "[joulebook] demo people already present",
  );
} finally {
  await pool.end();
}

// The estate goes through the app's own ingest modules, which read the
// validated environment; no e-mail is sent while seeding.
process.env.RESEND_BASE_URL ??= "http://127.0.0.1:9";
// Nor is Stripe called: a dead local address satisfies the check.
if (!process.env.STRIPE_SECRET_KEY)
  process.env.STRIPE_API_BASE ??= "http://127.0.0.1:9";
const { seedEstate } = await import("./seed-estate");
const { pool: appPool } = await import("../app/db/client.server");
try {
  const seeded = await seedEstate();
  console.log(
    seeded
      ? "[joulebook] demo estate seeded"
      : "[joulebook] demo estate already present",
  );
} finally {
  await appPool.end();
}
