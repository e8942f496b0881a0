import type { ReactNode } from "react";
import { cx } from "~/components/ui";

export interface FigureColumn {
  label: ReactNode;
  /** Figures stand right, words left (the default). */
  align?: "left" | "right";
  /** More classes for the heading cell, e.g. `font-mono` for a file's own column names. */
  className?: string;
}

/**
 * A compact table of figures in a box of its own: small type, a tinted
 * heading row, rows the caller draws. With `maxHeight` the box scrolls both
 * ways and keeps the headings in view; without, it scrolls sideways only.
 */
export function FigureTable({
  columns,
  caption,
  captionVisible = false,
  maxHeight,
  bordered = false,
  className,
  children,
}: {
  columns: FigureColumn[];
  caption?: ReactNode;
  /** A caption is for screen readers unless it says something all should read. */
  captionVisible?: boolean;
  maxHeight?: "max-h-72" | "max-h-80" | "max-h-96";
  bordered?: boolean;
  className?: string;
  children: ReactNode;
}) {
  return (
    <div
      className={cx(
        className,
        maxHeight,
        maxHeight ? "overflow-auto" : "overflow-x-auto",
        bordered && "rounded-lg border border-line",
      )}
    >
      <table className="min-w-full text-sm">
        {caption ? (
          <caption
            className={
              captionVisible ? "px-2 py-1 text-left font-semibold" : "sr-only"
            }
          >
            {caption}
          </caption>
        ) : null}
        <thead className={cx(maxHeight && "sticky top-0", "bg-sunken")}>
          <tr>
            {columns.map((column, i) => (
              <th
                key={i}
                className={cx(
                  "px-2 py-1",
                  column.align === "right" ? "text-right" : "text-left",
                  column.className,
                )}
              >
                {column.label}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>{children}</tbody>
      </table>
    </div>
  );
}
