import { Notice } from "./ui";

/** The standing cautions of design.md, shown wherever figures are used. */
export function Cautions() {
  return (
    <Notice tone="caution" title="Before you rely on these figures">
      <ul className="mt-1 list-disc space-y-1 pl-5">
        <li>Figures are for energy management, not for trade.</li>
        <li>
          Billing third parties from sub-meters needs meters approved under your
          local legal-metrology rules.
        </li>
        <li>
          Steam and pressurised hot water are hazardous: installation and
          maintenance belong to qualified people working to local codes.
        </li>
      </ul>
    </Notice>
  );
}
