import { describe, expect, it } from "vitest";
import { parseReading } from "./reading-schema";
import { quantities } from "../sites/meter-kinds";
import { rowToReading } from "./csv";
import { readCsv } from "./supplier-files/read-csv";
import { toTable } from "./supplier-files/table";
import { apiFieldTemplate, UPLOAD_QUANTITIES } from "./upload-quantities";

describe("API-field templates", () => {
  it("has one per meter kind", () => {
    expect(UPLOAD_QUANTITIES.map((q) => q.quantity).sort()).toEqual(
      [...quantities].sort(),
    );
  });

  it.each([...quantities])(
    "%s: the example row, read as the upload reads it, is a valid reading",
    (quantity) => {
      const table = toTable(readCsv(apiFieldTemplate(quantity)))!;
      const row = Object.fromEntries(
        table.header.map((h, i) => [h, String(table.rows[0].cells[i])]),
      );
      const parsed = parseReading(
        rowToReading(row),
        new Date("2026-12-01T00:00:00Z"),
      );
      expect(parsed).toMatchObject({ ok: true });
    },
  );
});
