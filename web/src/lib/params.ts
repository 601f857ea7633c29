/** A positive integer id from a URL segment; anything else is a 404 for the route's error element. */
export function idParam(value: string | undefined): number {
  const id = Number(value);
  if (!Number.isSafeInteger(id) || id <= 0) throw new Response("Not found", { status: 404, statusText: "Not found" });
  return id;
}
