import { useState } from "react";
import { Button, Notice } from "~/components/ui";

/** The secret of a token just made: shown this once, with a copy button. */
export function NewTokenSecret({
  name,
  secret,
}: {
  name: string;
  secret: string;
}) {
  const [copied, setCopied] = useState(false);
  const copy = async () => {
    await navigator.clipboard.writeText(secret);
    setCopied(true);
  };
  return (
    <Notice tone="success" title={`Token for ${name}: copy it now`}>
      <p>
        This is the only time the token is shown; Joulebook keeps only a hash of
        it. Send it as <code>Authorization: Bearer &lt;token&gt;</code>.
      </p>
      <div className="mt-2 flex flex-wrap items-center gap-3">
        <p
          className="grow break-all rounded bg-surface px-3 py-2 font-mono text-ink"
          data-testid="new-api-token"
        >
          {secret}
        </p>
        <Button type="button" variant="secondary" onClick={() => void copy()}>
          {copied ? "Copied" : "Copy token"}
        </Button>
      </div>
    </Notice>
  );
}
