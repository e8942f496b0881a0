import type { ReactNode } from "react";

/** A card's one large figure (a count, an amount), found by tests by its id. */
export function BigFigure({
  testId,
  children,
}: {
  testId: string;
  children: ReactNode;
}) {
  return (
    <p className="text-4xl font-semibold" data-testid={testId}>
      {children}
    </p>
  );
}
