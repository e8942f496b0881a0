import { useState } from "react";
import { useLocation, useSearchParams } from "react-router";

/**
 * The filters, kept in the URL. A change shows in its field at once: the URL
 * follows in a transition, and a controlled field waiting for a transition
 * would jump back meanwhile. The draft belongs to the location it was made
 * on, so any later navigation (the nav link, back) shows the URL again.
 */
export function useUrlFilters() {
  const [params, setParams] = useSearchParams();
  const { key } = useLocation();
  const [draft, setDraft] = useState<{
    key: string;
    values: Record<string, string>;
  }>({ key: "", values: {} });
  const pending = draft.key === key ? draft.values : {};
  const get = (name: string): string =>
    Object.hasOwn(pending, name) ? pending[name] : (params.get(name) ?? "");
  /** Sets one filter; an empty value falls back to its default. */
  const set = (name: string, value: string) => setAll({ [name]: value });
  /** Sets several filters at once (a financial period's first and last month). */
  const setAll = (changes: Record<string, string>) => {
    const values = { ...pending, ...changes };
    setDraft({ key, values });
    const next = new URLSearchParams(params);
    for (const [k, v] of Object.entries(values)) {
      if (v) next.set(k, v);
      else next.delete(k);
    }
    setParams(next, { replace: true, preventScrollReset: true });
  };
  return [get, set, setAll] as const;
}
