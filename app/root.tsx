import {
  isRouteErrorResponse,
  Links,
  Meta,
  Outlet,
  Scripts,
  ScrollRestoration,
} from "react-router";
import type { Route } from "./+types/root";
import { pageOrOutage } from "./db/unavailable.server";
import { ErrorPage } from "./components/error-page";
import "./app.css";

/** A page whose database went away mid-request answers 503, not 500. */
export const middleware: Route.MiddlewareFunction[] = [
  async (_args, next) => pageOrOutage(await next()),
];

export const links: Route.LinksFunction = () => [
  { rel: "icon", href: "/favicon.svg", type: "image/svg+xml" },
];

export function Layout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en-GB">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <meta name="color-scheme" content="light" />
        <Meta />
        <Links />
      </head>
      <body>
        {children}
        <ScrollRestoration />
        <Scripts />
      </body>
    </html>
  );
}

export default function App() {
  return <Outlet />;
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  if (isRouteErrorResponse(error)) {
    return <ErrorPage status={error.status} message={messageOf(error.data)} />;
  }
  // The details stay in the server log; people get a plain explanation.
  return <ErrorPage status={500} />;
}

function messageOf(data: unknown): string | undefined {
  if (typeof data === "string") return data;
  if (data && typeof data === "object" && "message" in data) {
    return String((data as { message: unknown }).message);
  }
  return undefined;
}
