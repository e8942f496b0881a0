/**
 * The entry point of the supplier-file layer: a table read from a CSV or
 * XLSX file, a column mapping, the site's time zone → `interval_energy`
 * readings and the refusals, row by row. Never throws on bad input.
 */
import type { ParseOptions } from "./layout-common";
import { parseLongLayout, type LongLayoutMapping } from "./long-layout";
import type { ParseResult, Table } from "./types";
import { parseWideLayout, type WideLayoutMapping } from "./wide-layout";

export type SupplierFileMapping = LongLayoutMapping | WideLayoutMapping;

export function parseSupplierFile(
  table: Table,
  mapping: SupplierFileMapping,
  options: ParseOptions,
): ParseResult {
  return mapping.layout === "long"
    ? parseLongLayout(table, mapping, options)
    : parseWideLayout(table, mapping, options);
}
