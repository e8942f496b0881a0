import { useCallback, useEffect, useRef, useState } from "react";
import type { Interval, IntervalPage } from "~/api/schemas";

/** The API's own types (`GET …/intervals` answers `intervalPageSchema`). */
export type { Interval, IntervalPage } from "~/api/schemas";

/**
 * Each quality in the trade's words: an hour read from a meter is "actual"
 * (the API's `measured` stays the field value).
 */
export const qualityLabels: Record<Interval["quality"], string> = {
  measured: "Actual",
  estimated: "Estimated",
  edited: "Corrected",
  missing: "Missing",
};

/** While the newest range is open, new readings show up without a reload. */
const POLL_MS = 15_000;

/**
 * Fetches a meter's intervals from the JSON API, for a time range or, with
 * no range, for the last week up to the newest hour, polling for new data.
 */
export function useIntervals(
  orgId: string,
  meterId: string,
  range: { from: string; to: string } | null,
) {
  const [page, setPage] = useState<IntervalPage | null>(null);
  const [error, setError] = useState<string | null>(null);
  // Loading is derived: the range asked for differs from the one shown.
  const key = range ? `${range.from}|${range.to}` : "latest";
  const [loadedKey, setLoadedKey] = useState<string | null>(null);
  const [updatedAt, setUpdatedAt] = useState<Date | null>(null);
  const generation = useRef(0);

  const load = useCallback(async () => {
    const mine = ++generation.current;
    const query = range
      ? `?from=${encodeURIComponent(range.from)}&to=${encodeURIComponent(range.to)}`
      : "";
    try {
      const response = await fetch(
        `/api/v1/orgs/${orgId}/meters/${meterId}/intervals${query}`,
      );
      const body = await response.json();
      if (mine !== generation.current) return;
      if (!response.ok)
        throw new Error(
          body?.error?.message ?? `The server answered ${response.status}.`,
        );
      setPage(body as IntervalPage);
      setError(null);
      setUpdatedAt(new Date());
    } catch (e) {
      if (mine === generation.current) setError((e as Error).message);
    } finally {
      if (mine === generation.current) setLoadedKey(key);
    }
  }, [orgId, meterId, range, key]);

  useEffect(() => {
    const first = setTimeout(() => void load(), 0);
    const timer = range ? null : setInterval(() => void load(), POLL_MS);
    return () => {
      clearTimeout(first);
      if (timer) clearInterval(timer);
    };
  }, [load, range]);

  return { page, error, loading: loadedKey !== key, updatedAt, reload: load };
}
