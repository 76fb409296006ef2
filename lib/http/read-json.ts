import { AppError } from "./errors";

export const DEFAULT_MAX_BODY_BYTES = 64 * 1024;

/**
 * Reads a JSON request body with a hard size limit. The body is streamed and
 * counted, so a client cannot make us buffer more than the limit by lying in
 * Content-Length.
 */
export async function readJsonBody(
  request: Request,
  { maxBytes = DEFAULT_MAX_BODY_BYTES } = {},
): Promise<unknown> {
  const type = request.headers.get("content-type") ?? "";
  if (!type.toLowerCase().includes("application/json")) {
    throw new AppError(
      "unsupported_media_type",
      "Send the body as JSON with Content-Type: application/json.",
    );
  }
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > maxBytes) throw tooLarge(maxBytes);
  if (!request.body) throw new AppError("invalid_json", "The request body is empty; send a JSON object.");

  const reader = request.body.getReader();
  const chunks: Buffer[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > maxBytes) {
      await reader.cancel();
      throw tooLarge(maxBytes);
    }
    chunks.push(Buffer.from(value));
  }
  const text = new TextDecoder().decode(Buffer.concat(chunks));
  if (!text.trim()) throw new AppError("invalid_json", "The request body is empty; send a JSON object.");
  try {
    return JSON.parse(text);
  } catch {
    throw new AppError("invalid_json", "The request body is not valid JSON.");
  }
}

function tooLarge(maxBytes: number): AppError {
  return new AppError(
    "payload_too_large",
    `The request body is larger than ${Math.round(maxBytes / 1024)} KB.`,
  );
}
