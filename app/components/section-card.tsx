import type { ReactNode } from "react";
import { Card } from "~/components/ui";

/**
 * A card that is a section of its page: a heading that names it (and labels
 * it for assistive technology), then what it shows.
 */
export function SectionCard({
  id,
  title,
  children,
}: {
  /** Unique on the page: the heading's id is `<id>-heading`. */
  id: string;
  title: ReactNode;
  children: ReactNode;
}) {
  const headingId = `${id}-heading`;
  return (
    <Card aria-labelledby={headingId}>
      <h2 id={headingId} className="text-lg">
        {title}
      </h2>
      {children}
    </Card>
  );
}
