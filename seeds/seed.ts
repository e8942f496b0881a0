/** `npm start` runs this once per database: the demo goes in only if absent. */
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
      ? "[joulebook] demo data seeded"
      : "[joulebook] demo data already present",
  );
} finally {
  await pool.end();
}
