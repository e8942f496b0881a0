import type { ComponentProps, ReactNode } from "react";
import { useId } from "react";

export function cx(...classes: (string | false | null | undefined)[]): string {
  return classes.filter(Boolean).join(" ");
}

const buttonStyles = {
  primary:
    "bg-spruce-700 text-white hover:bg-spruce-800 active:bg-spruce-900 disabled:bg-line-strong",
  secondary:
    "bg-surface text-ink ring-1 ring-inset ring-line-strong hover:bg-sunken disabled:text-ink-faint",
  danger:
    "bg-surface text-danger-700 ring-1 ring-inset ring-danger-600/50 hover:bg-danger-50",
  quiet: "text-spruce-700 hover:bg-spruce-50",
} as const;

/** A button's look, for a link that acts as one (e.g. a step of a form). */
export function buttonClass(
  variant: keyof typeof buttonStyles = "primary",
  className?: string,
): string {
  return cx(
    "inline-flex min-h-10 items-center justify-center gap-2 rounded-lg px-4 text-[15px] font-semibold transition-colors disabled:cursor-not-allowed",
    buttonStyles[variant],
    className,
  );
}

export function Button({
  variant = "primary",
  className,
  ...props
}: ComponentProps<"button"> & { variant?: keyof typeof buttonStyles }) {
  return <button className={buttonClass(variant, className)} {...props} />;
}

export function Card({ className, ...props }: ComponentProps<"section">) {
  return (
    <section
      className={cx(
        "rounded-card border border-line bg-surface p-5 shadow-card sm:p-6",
        className,
      )}
      {...props}
    />
  );
}

export function PageHeader({
  title,
  description,
  actions,
}: {
  title: string;
  description?: ReactNode;
  actions?: ReactNode;
}) {
  return (
    <header className="mb-6 flex flex-col gap-3 sm:flex-row sm:items-end sm:justify-between">
      <div>
        <h1 className="text-display">{title}</h1>
        {description ? (
          <p className="mt-1 max-w-2xl text-ink-muted">{description}</p>
        ) : null}
      </div>
      {actions ? <div className="flex gap-2">{actions}</div> : null}
    </header>
  );
}

interface FieldProps extends ComponentProps<"input"> {
  label: string;
  error?: string;
  hint?: string;
}

/** A labelled input whose error is announced and tied to it. */
export function Field({ label, error, hint, className, ...input }: FieldProps) {
  const id = useId();
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  return (
    <div className={cx("flex flex-col gap-1", className)}>
      <label htmlFor={id} className="font-semibold">
        {label}
      </label>
      {hint ? (
        <p id={hintId} className="text-sm text-ink-muted">
          {hint}
        </p>
      ) : null}
      <input
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={
          [hintId, errorId].filter(Boolean).join(" ") || undefined
        }
        className={cx(
          "min-h-10 rounded-lg border bg-surface px-3 text-ink placeholder:text-ink-faint",
          error ? "border-danger-600" : "border-line-strong",
        )}
        {...input}
      />
      {error ? (
        <p id={errorId} className="text-sm font-semibold text-danger-700">
          {error}
        </p>
      ) : null}
    </div>
  );
}

export function SelectField({
  label,
  error,
  hideLabel = false,
  children,
  className,
  ...select
}: ComponentProps<"select"> & {
  label: string;
  error?: string;
  /** For rows where a column heading already says what the field is. */
  hideLabel?: boolean;
}) {
  const id = useId();
  return (
    <div className={cx("flex flex-col gap-1", className)}>
      <label htmlFor={id} className={hideLabel ? "sr-only" : "font-semibold"}>
        {label}
      </label>
      <select
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : undefined}
        className="min-h-10 rounded-lg border border-line-strong bg-surface px-3 text-ink"
        {...select}
      >
        {children}
      </select>
      {error ? (
        <p id={`${id}-error`} className="text-sm font-semibold text-danger-700">
          {error}
        </p>
      ) : null}
    </div>
  );
}

const noticeStyles = {
  info: "border-spruce-600/30 bg-spruce-50 text-spruce-900",
  success: "border-spruce-600/40 bg-spruce-50 text-spruce-900",
  error: "border-danger-600/40 bg-danger-50 text-danger-700",
  caution: "border-caution-700/30 bg-caution-50 text-caution-700",
} as const;

export function Notice({
  tone = "info",
  title,
  children,
}: {
  tone?: keyof typeof noticeStyles;
  title?: string;
  children: ReactNode;
}) {
  return (
    <div
      role={tone === "error" ? "alert" : "status"}
      className={cx("rounded-lg border px-4 py-3", noticeStyles[tone])}
    >
      {title ? <p className="font-semibold">{title}</p> : null}
      <div className={title ? "mt-0.5" : undefined}>{children}</div>
    </div>
  );
}

export function EmptyState({
  title,
  children,
}: {
  title: string;
  children?: ReactNode;
}) {
  return (
    <div className="rounded-card border border-dashed border-line-strong bg-paper px-6 py-10 text-center">
      <BoundaryMark className="mx-auto h-10 w-10 opacity-70" />
      <p className="mt-3 font-semibold">{title}</p>
      {children ? <div className="mt-1 text-ink-muted">{children}</div> : null}
    </div>
  );
}

export function Badge({
  tone = "neutral",
  children,
}: {
  tone?: "neutral" | "spruce" | "copper" | "frost" | "danger";
  children: ReactNode;
}) {
  const tones = {
    neutral: "bg-sunken text-ink-muted",
    spruce: "bg-spruce-50 text-spruce-800",
    copper: "bg-copper-50 text-copper-700",
    frost: "bg-frost-50 text-frost-700",
    danger: "bg-danger-50 text-danger-700",
  };
  return (
    <span
      className={cx(
        "inline-flex items-center rounded-full px-2.5 py-0.5 text-sm font-semibold",
        tones[tone],
      )}
    >
      {children}
    </span>
  );
}

/** The product mark: a dashed system boundary with energy crossing it. */
export function BoundaryMark({ className }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" aria-hidden="true" className={className}>
      <rect
        x="5"
        y="5"
        width="22"
        height="22"
        rx="5"
        fill="none"
        stroke="currentColor"
        strokeWidth="2.5"
        strokeDasharray="4 2.5"
        className="text-spruce-700"
      />
      <path
        d="M1 16h11m-4-4 4 4-4 4"
        className="text-copper-600"
        stroke="currentColor"
        strokeWidth="2.5"
        fill="none"
        strokeLinecap="round"
        strokeLinejoin="round"
      />
      <path
        d="M20 16h11m-4-4 4 4-4 4"
        className="text-frost-600"
        stroke="currentColor"
        strokeWidth="2.5"
        fill="none"
        strokeLinecap="round"
        strokeLinejoin="round"
      />
    </svg>
  );
}

export function Wordmark({ inverted = false }: { inverted?: boolean }) {
  return (
    <span className="inline-flex items-center gap-2">
      <BoundaryMark className="h-8 w-8" />
      <span
        className={cx(
          "text-xl font-bold tracking-tight",
          inverted ? "text-white" : "text-ink",
        )}
      >
        Joulebook
      </span>
    </span>
  );
}
