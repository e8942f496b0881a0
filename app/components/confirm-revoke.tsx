import { useEffect, useRef, type ReactNode } from "react";
import { Form, Link } from "react-router";
import { Button, buttonClass } from "~/components/ui";

/**
 * The second step of revoking a credential (a gateway's key, an API token):
 * a form that names what is cut off, says what that means, and alone sends
 * `confirm=yes`. The page's `?revoke=<id>` shows it; Cancel goes back.
 */
export function ConfirmRevoke({
  id,
  name,
  fields,
  children,
}: {
  /** The credential's id, for the heading's id. */
  id: string;
  name: string;
  /** Hidden fields naming what to revoke, besides intent and confirm. */
  fields: Record<string, string>;
  /** What revoking cuts off, in words. */
  children: ReactNode;
}) {
  const heading = useRef<HTMLHeadingElement>(null);
  // Arriving here by the Revoke… link, keyboard and screen-reader users land
  // on the question rather than at the top of the page.
  useEffect(() => heading.current?.focus(), []);
  return (
    <Form
      method="post"
      preventScrollReset
      aria-labelledby={`revoke-${id}`}
      className="mt-3 flex flex-col gap-3 rounded-lg border border-danger-600/30 bg-danger-50 p-4"
    >
      <input type="hidden" name="intent" value="revoke" />
      {Object.entries(fields).map(([field, value]) => (
        <input key={field} type="hidden" name={field} value={value} />
      ))}
      <input type="hidden" name="confirm" value="yes" />
      <h3
        id={`revoke-${id}`}
        ref={heading}
        tabIndex={-1}
        className="font-semibold outline-none"
      >
        Revoke {name}?
      </h3>
      <p>{children}</p>
      <div className="flex flex-wrap gap-3">
        <Button type="submit" variant="danger">
          Revoke {name}
        </Button>
        <Link to="." preventScrollReset className={buttonClass("secondary")}>
          Cancel
        </Link>
      </div>
    </Form>
  );
}
