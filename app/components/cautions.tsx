import { CAUTIONS } from "~/lib/cautions";
import { Notice } from "./ui";

/** The standing cautions of design.md, shown wherever figures are used. */
export function Cautions() {
  return (
    <Notice tone="caution" title="Before you rely on these figures">
      <ul className="mt-1 list-disc space-y-1 pl-5">
        {CAUTIONS.map((caution) => (
          <li key={caution}>{caution}</li>
        ))}
      </ul>
    </Notice>
  );
}
