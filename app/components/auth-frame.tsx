import type { ReactNode } from "react";
import { Wordmark } from "./ui";

/** The frame of the signed-out pages: a brand panel beside the form. */
export function AuthFrame({
  title,
  intro,
  children,
}: {
  title: string;
  intro?: ReactNode;
  children: ReactNode;
}) {
  return (
    <div className="grid min-h-screen lg:grid-cols-[minmax(0,5fr)_minmax(0,6fr)]">
      <aside className="relative hidden overflow-hidden bg-spruce-900 p-12 text-spruce-50 lg:flex lg:flex-col lg:justify-between">
        <Wordmark inverted />
        <div className="max-w-md">
          <p className="text-3xl font-semibold leading-tight text-white">
            Every joule that crosses a site's boundary, metered and accounted
            for.
          </p>
          <p className="mt-4 text-spruce-100">
            Readings from heat, steam, chilled-water and electricity meters
            become monthly ledgers that managers close, finance pays for and
            auditors can verify.
          </p>
        </div>
        <BoundaryIllustration />
      </aside>
      <main className="flex items-center justify-center px-5 py-10 sm:px-10">
        <div className="w-full max-w-md">
          <div className="mb-8 lg:hidden">
            <Wordmark />
          </div>
          <h1 className="text-display">{title}</h1>
          {intro ? <div className="mt-2 text-ink-muted">{intro}</div> : null}
          <div className="mt-8">{children}</div>
        </div>
      </main>
    </div>
  );
}

/** A site boundary with imports in (+) and exports out (−). */
function BoundaryIllustration() {
  return (
    <svg viewBox="0 0 360 150" className="w-full max-w-md" aria-hidden="true">
      <rect
        x="110"
        y="20"
        width="140"
        height="110"
        rx="14"
        fill="none"
        stroke="#cfe5dc"
        strokeWidth="2"
        strokeDasharray="8 6"
      />
      <text x="180" y="80" textAnchor="middle" fill="#cfe5dc" fontSize="14">
        site
      </text>
      {[
        { y: 45, color: "#e7a77d", label: "+ heat" },
        { y: 75, color: "#e7a77d", label: "+ electricity" },
      ].map((a) => (
        <g key={a.label}>
          <path
            d={`M10 ${a.y}h92m-10-7 10 7-10 7`}
            stroke={a.color}
            strokeWidth="3"
            fill="none"
            strokeLinecap="round"
            strokeLinejoin="round"
          />
          <text x="12" y={a.y - 8} fill={a.color} fontSize="12">
            {a.label}
          </text>
        </g>
      ))}
      <path
        d="M258 105h92m-10-7 10 7-10 7"
        stroke="#9cc3ee"
        strokeWidth="3"
        fill="none"
        strokeLinecap="round"
        strokeLinejoin="round"
      />
      <text x="262" y="97" fill="#9cc3ee" fontSize="12">
        − solar export
      </text>
    </svg>
  );
}
