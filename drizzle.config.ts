import { defineConfig } from "drizzle-kit";

// drizzle-kit only generates SQL from the schema; migrations are applied at
// start-up by scripts/migrate.ts so that start and test use the same path.
export default defineConfig({
  dialect: "postgresql",
  schema: "./app/db/schema.ts",
  out: "./drizzle",
  dbCredentials: {
    url: process.env.DATABASE_URL ?? "postgres://localhost/unused",
  },
});
