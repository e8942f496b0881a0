import type { ReactNode } from "react";
import { cx } from "~/components/ui";

const linkButton =
  "inline-flex min-h-10 items-center justify-center rounded-lg bg-surface px-4 text-[15px] font-semibold text-ink ring-1 ring-inset ring-line-strong";

/**
 * A download that looks like a secondary button. Without an `href` (the
 * filters cannot be asked for yet) it shows, greyed out, and leads nowhere.
 */
export function ExportLink({
  href,
  children,
}: {
  href: string | null;
  children: ReactNode;
}) {
  if (href === null)
    return (
      <a
        aria-disabled="true"
        className={cx(linkButton, "cursor-not-allowed text-ink-faint")}
      >
        {children}
      </a>
    );
  return (
    <a href={href} download className={cx(linkButton, "hover:bg-sunken")}>
      {children}
    </a>
  );
}
