// Placeholder resource route: replaced in this change.
export function loader() {
  return new Response("Not yet", { status: 404 });
}
