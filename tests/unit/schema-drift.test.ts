/**
 * The schema is the whole truth: drizzle-kit, asked to generate a migration
 * from app/db/schema.ts against a copy of the committed migrations, must find
 * nothing to do. A change to the schema without its migration (or a
 * migration edited by hand past its snapshot) fails here.
 */
import { execFileSync } from "node:child_process";
import { cpSync, mkdirSync, mkdtempSync, readdirSync, rmSync } from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";

// drizzle-kit reads --out relative to the project, so the copy lives inside it.
mkdirSync(".data", { recursive: true });
const probe = mkdtempSync(path.join(".data", "drift-probe-"));
afterAll(() => rmSync(probe, { recursive: true, force: true }));

describe("schema and migrations", () => {
  it("drizzle-kit finds no change between app/db/schema.ts and drizzle/", () => {
    const out = path.join(probe, "drizzle");
    cpSync("drizzle", out, { recursive: true });
    const before = readdirSync(out).sort();
    const printed = execFileSync(
      process.execPath,
      [
        "node_modules/drizzle-kit/bin.cjs",
        "generate",
        "--dialect",
        "postgresql",
        "--schema",
        "./app/db/schema.ts",
        "--out",
        `./${out}`,
      ],
      { encoding: "utf8", stdio: ["ignore", "pipe", "pipe"] },
    );
    expect(readdirSync(out).sort()).toEqual(before);
    expect(printed).toContain("No schema changes");
  }, 60_000);
});
