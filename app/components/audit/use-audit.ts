import { useCallback, useEffect, useRef, useState } from "react";

/** One entry as GET /api/v1/orgs/:orgId/audit answers it. */
export interface AuditEntry {
  id: number;
  occurred_at: string;
  action: string;
  action_label: string;
  kind: string | null;
  kind_label: string | null;
  actor: {
    type: "person" | "gateway" | "token" | "system";
    id: string | null;
    name: string;
  };
  site: { id: string; name: string } | null;
  meter: { id: string; code: string; name: string } | null;
  subject: string;
  reason: string | null;
  changes: { field: string; before: string; after: string }[];
}

/** The filters the page keeps in its URL, under the API's own names. */
export const auditFilterNames = [
  "site",
  "meter",
  "person",
  "kind",
  "from",
  "to",
  "month",
  "carrier",
  "since",
] as const;
export type AuditFilterName = (typeof auditFilterNames)[number];

/**
 * The query string shared by the JSON pages and the CSV export: filters left
 * empty are left out; days are read in the browser's time zone.
 */
export function auditQuery(
  filters: Partial<Record<AuditFilterName, string>>,
  timeZone: string,
): string {
  const query = new URLSearchParams();
  for (const name of auditFilterNames) {
    const value = filters[name];
    if (value) query.set(name, value);
  }
  if (filters.from || filters.to) query.set("tz", timeZone);
  return query.toString();
}

interface Page {
  entries: AuditEntry[];
  next_before: number | null;
}

async function fetchPage(url: string): Promise<Page> {
  const response = await fetch(url);
  const body = await response.json().catch(() => null);
  if (!response.ok)
    throw new Error(
      body?.error?.message ?? `The server answered ${response.status}.`,
    );
  return body as Page;
}

/**
 * The entries for a query, newest first, and a way to fetch older ones; no
 * request while the query is null (filters that cannot be asked for yet).
 */
export function useAuditEntries(orgId: string, query: string | null) {
  const [state, setState] = useState<{
    key: string | null;
    entries: AuditEntry[];
    nextBefore: number | null;
    error: string | null;
  }>({ key: null, entries: [], nextBefore: null, error: null });
  const [loadingMore, setLoadingMore] = useState(false);
  // A slow answer to an older query never replaces a newer one.
  const generation = useRef(0);
  const url = `/api/v1/orgs/${orgId}/audit?${query ?? ""}`;

  useEffect(() => {
    if (query === null) return;
    const mine = ++generation.current;
    fetchPage(url).then(
      (page) => {
        if (mine !== generation.current) return;
        setState({
          key: query,
          entries: page.entries,
          nextBefore: page.next_before,
          error: null,
        });
      },
      (error: Error) => {
        if (mine !== generation.current) return;
        setState({
          key: query,
          entries: [],
          nextBefore: null,
          error: error.message,
        });
      },
    );
  }, [url, query]);

  const loadOlder = useCallback(async () => {
    if (state.nextBefore === null || state.key !== query) return;
    const mine = generation.current;
    setLoadingMore(true);
    try {
      const page = await fetchPage(`${url}&before=${state.nextBefore}`);
      if (mine !== generation.current) return;
      setState((s) => ({
        ...s,
        entries: [...s.entries, ...page.entries],
        nextBefore: page.next_before,
      }));
    } catch (error) {
      if (mine === generation.current)
        setState((s) => ({ ...s, error: (error as Error).message }));
    } finally {
      setLoadingMore(false);
    }
  }, [url, query, state.key, state.nextBefore]);

  const current = query !== null && state.key === query;
  return {
    entries: current ? state.entries : [],
    error: current ? state.error : null,
    loading: query !== null && !current,
    hasOlder: current && state.nextBefore !== null,
    loadingMore,
    loadOlder,
  };
}
