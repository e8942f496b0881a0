import type { ReactNode } from "react";
import { Card } from "~/components/ui";

/** A card under its own heading, which names the card for screen readers. */
export function SectionCard({
  headingId,
  title,
  className,
  children,
}: {
  headingId: string;
  title: ReactNode;
  className?: string;
  children: ReactNode;
}) {
  return (
    <Card aria-labelledby={headingId} className={className}>
      <h2 id={headingId} className="text-lg">
        {title}
      </h2>
      {children}
    </Card>
  );
}
