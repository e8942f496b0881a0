/**
 * Layers point one way: the domain folders (what Joulebook knows about
 * energy, sites, money and reports) know nothing of HTTP. They must not
 * import Express, the JSON API (app/api), the pages (app/routes) or the look
 * (app/components); those import the domain, never the other way round.
 */
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import ts from "typescript";
import { describe, expect, it } from "vitest";

const appDir = path.resolve(import.meta.dirname, "../../app");

const domainFolders = [
  "alerts",
  "audit",
  "baselines",
  "billing",
  "email",
  "gateways",
  "ingest",
  "ledger",
  "organizations",
  "overview",
  "physics",
  "reports",
  "sites",
];

const upperLayers = ["api", "routes", "components"];

/** Every module specifier a source file imports or re-exports, dynamic imports too. */
function importsOf(source: string): string[] {
  return ts
    .preProcessFile(source, true, true)
    .importedFiles.map((file) => file.fileName);
}

/** Why `specifier`, imported by `fromFile`, breaks the layering; null when it does not. */
function violation(fromFile: string, specifier: string): string | null {
  if (
    /^(express|@react-router\/express|@types\/express)(\/|-|$)/.test(specifier)
  )
    return `imports ${specifier}`;
  const target = specifier.startsWith("~/")
    ? path.join(appDir, specifier.slice(2))
    : specifier.startsWith(".")
      ? path.resolve(path.dirname(fromFile), specifier)
      : null;
  if (!target) return null;
  const [layer] = path.relative(appDir, target).split(path.sep);
  return upperLayers.includes(layer) ? `imports ${specifier}` : null;
}

function sourceFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true, recursive: true })
    .filter((entry) => entry.isFile() && /\.tsx?$/.test(entry.name))
    .map((entry) => path.join(entry.parentPath, entry.name));
}

describe("layers point one way", () => {
  it("no domain module imports Express, app/api, app/routes or app/components", () => {
    const problems: string[] = [];
    for (const folder of domainFolders) {
      for (const file of sourceFiles(path.join(appDir, folder))) {
        for (const specifier of importsOf(readFileSync(file, "utf8"))) {
          const why = violation(file, specifier);
          if (why) problems.push(`${path.relative(appDir, file)} ${why}`);
        }
      }
    }
    expect(problems).toEqual([]);
  });

  it("the check sees every way of importing across the line", () => {
    const file = path.join(appDir, "ledger", "some-module.server.ts");
    const source = [
      `import express from "express";`,
      `import type { Request } from "express";`,
      `import rateLimit from "express-rate-limit";`,
      `import type { Ledger } from "~/api/schemas";`,
      `export { LedgerGrid } from "~/components/ledger/ledger-grid";`,
      `import { loader } from "../routes/ledger";`,
      `const later = await import("../api/router.server");`,
      `import { pool } from "~/db/client.server";`,
      `import { deliveredSignSql } from "./delivered";`,
      `import { z } from "zod";`,
    ].join("\n");
    const flagged = importsOf(source).filter((s) => violation(file, s));
    expect(flagged).toEqual([
      "express",
      "express",
      "express-rate-limit",
      "~/api/schemas",
      "~/components/ledger/ledger-grid",
      "../routes/ledger",
      "../api/router.server",
    ]);
  });
});
