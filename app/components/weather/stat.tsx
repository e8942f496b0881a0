import type { ReactNode } from "react";
import { Badge } from "~/components/ui";

/** One figure of a `<dl>` grid: its label, the figure, and a badge if it is judged. */
export function Stat({
  label,
  children,
  badge,
}: {
  label: string;
  children: ReactNode;
  badge?: ReactNode;
}) {
  return (
    <div className="rounded-lg bg-paper px-3 py-2">
      <dt className="text-sm text-ink-muted">{label}</dt>
      <dd className="text-lg font-semibold tabular-nums">{children}</dd>
      {badge ? <dd className="mt-1">{badge}</dd> : null}
    </div>
  );
}

export function PassBadge({ pass }: { pass: boolean }) {
  return pass ? (
    <Badge tone="spruce">Pass</Badge>
  ) : (
    <Badge tone="danger">Fail</Badge>
  );
}
