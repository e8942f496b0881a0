/** A form body larger than the reader accepts. */
export class FormTooLarge extends Error {}

/**
 * Reads a form body of at most `limit` bytes, whatever its length header
 * says. A body somewhat over the limit (up to `drainLimit`) is read to its
 * end and dropped, so the sender gets the answer rather than a reset
 * connection; a larger one is cut off. Either way it throws FormTooLarge.
 */
export async function readBoundedForm(
  request: Request,
  { limit, drainLimit }: { limit: number; drainLimit: number },
): Promise<FormData> {
  const declared = Number(request.headers.get("content-length"));
  if (Number.isFinite(declared) && declared > drainLimit)
    throw new FormTooLarge();
  const chunks: Uint8Array[] = [];
  let size = 0;
  if (request.body) {
    const reader = request.body.getReader();
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      size += value.byteLength;
      if (size > drainLimit) {
        await reader.cancel();
        throw new FormTooLarge();
      }
      if (size <= limit) chunks.push(value);
    }
  }
  if (size > limit) throw new FormTooLarge();
  const headers = new Headers(request.headers);
  headers.delete("content-length");
  return new Request(request.url, {
    method: "POST",
    headers,
    body: Buffer.concat(chunks),
  }).formData();
}
