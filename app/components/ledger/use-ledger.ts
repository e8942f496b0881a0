import { useCallback, useEffect, useRef, useState } from "react";
import type { Ledger } from "~/api/schemas";
import type { LedgerUnit } from "~/ledger/ledger-units";

/**
 * The types are the API's own (`GET …/ledger` answers `ledgerSchema`):
 * one row per site, month and carrier, delivered (imports, ≥ 0) and exported
 * (exports, ≤ 0) kWh; chilled water is cooling delivered, a positive figure.
 */
export type { CarrierTotal, Ledger, LedgerRow } from "~/api/schemas";

export interface LedgerFilters {
  from: string;
  to: string;
  site: string;
  carrier: string;
}

/**
 * The query string shared by the JSON ledger and its CSV and XLSX exports:
 * empty site or carrier means all of them, so they are left out.
 */
export function ledgerQuery(filters: LedgerFilters): string {
  const query = new URLSearchParams({ from: filters.from, to: filters.to });
  if (filters.site) query.set("site", filters.site);
  if (filters.carrier) query.set("carrier", filters.carrier);
  return query.toString();
}

/**
 * The CSV and XLSX exports' query string: they follow the screen, so they
 * take the filters of `ledgerQuery` plus the unit and per m² as chosen (the
 * defaults, kWh and whole figures, are left out).
 */
export function exportQuery(
  query: string,
  view: { unit: LedgerUnit; perM2: boolean },
): string {
  const params = new URLSearchParams(query);
  if (view.unit !== "kWh") params.set("unit", view.unit);
  if (view.perM2) params.set("per", "m2");
  return params.toString();
}

/**
 * Fetches the ledger for a query string from `ledgerQuery`, or nothing while
 * the query is null (filters that cannot be asked for yet).
 */
export function useLedger(orgId: string, query: string | null) {
  const [ledger, setLedger] = useState<Ledger | null>(null);
  const [error, setError] = useState<string | null>(null);
  // Loading is derived: the query asked for differs from the one answered.
  const [loadedKey, setLoadedKey] = useState<string | null>(null);
  const generation = useRef(0);

  const load = useCallback(async () => {
    if (query === null) return;
    const mine = ++generation.current;
    try {
      const response = await fetch(`/api/v1/orgs/${orgId}/ledger?${query}`);
      const body = await response.json().catch(() => null);
      if (mine !== generation.current) return;
      if (!response.ok)
        throw new Error(
          body?.error?.message ?? `The server answered ${response.status}.`,
        );
      setLedger(body as Ledger);
      setError(null);
    } catch (e) {
      if (mine === generation.current) setError((e as Error).message);
    } finally {
      if (mine === generation.current) setLoadedKey(query);
    }
  }, [orgId, query]);

  useEffect(() => {
    const first = setTimeout(() => void load(), 0);
    return () => clearTimeout(first);
  }, [load]);

  return {
    // A null query shows nothing rather than the previous answer.
    ledger: query === null ? null : ledger,
    error: query === null ? null : error,
    loading: query !== null && loadedKey !== query,
    reload: load,
  };
}
