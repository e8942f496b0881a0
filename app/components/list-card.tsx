import type { ComponentProps, ReactNode } from "react";
import { SectionCard } from "~/components/section-card";
import { cx, EmptyState } from "~/components/ui";

/**
 * A card with a heading over a list, or over an empty state that says what
 * will appear there once there is something to list.
 */
export function ListCard({
  headingId,
  title,
  empty,
  list,
  children,
}: {
  headingId: string;
  title: ReactNode;
  /** Shown instead of the list when there is nothing in it. */
  empty: { title: string; text: ReactNode } | null;
  /** The list's own attributes (its spacing, `aria-live`). */
  list?: ComponentProps<"ul">;
  /** The list's items. */
  children: ReactNode;
}) {
  return (
    <SectionCard headingId={headingId} title={title}>
      {empty ? (
        <div className="mt-3">
          <EmptyState title={empty.title}>{empty.text}</EmptyState>
        </div>
      ) : (
        <ul {...list} className={cx(list?.className, "divide-y divide-line")}>
          {children}
        </ul>
      )}
    </SectionCard>
  );
}
