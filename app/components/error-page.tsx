import { Link } from "react-router";
import { BoundaryMark } from "./ui";

const explanations: Record<number, { title: string; text: string }> = {
  403: {
    title: "Not allowed for your role",
    text: "Your role in this organisation does not include this. An owner can change roles on the Members page.",
  },
  404: {
    title: "Nothing here",
    text: "The page or record does not exist, or it belongs to an organisation you are not a member of.",
  },
  413: {
    title: "Too large",
    text: "What was sent is larger than this page accepts.",
  },
  500: {
    title: "Something went wrong on our side",
    text: "Nothing you entered was half-saved. Try again in a moment; if it keeps happening, tell your administrator the time it happened.",
  },
};

export function ErrorPage({
  status,
  message,
}: {
  status: number;
  message?: string;
}) {
  const known = explanations[status] ?? explanations[500];
  return (
    <main className="mx-auto flex min-h-[70vh] max-w-xl flex-col items-start justify-center gap-4 px-6 py-16">
      <title>{`${known.title} · Joulebook`}</title>
      <BoundaryMark className="h-12 w-12" />
      <p className="font-mono text-sm text-ink-muted">Error {status}</p>
      <h1 className="text-display">{known.title}</h1>
      <p className="text-ink-muted">
        {message && status !== 500 ? message : known.text}
      </p>
      <Link
        to="/"
        className="rounded-lg bg-spruce-700 px-4 py-2 font-semibold text-white hover:bg-spruce-800"
      >
        Back to Joulebook
      </Link>
    </main>
  );
}
