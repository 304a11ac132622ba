// Helpers every API route uses, so all of them answer in one JSON shape:
// success: the data itself; failure: { "error": { "code", "message", "fields"? } }.
import type { z } from "zod";
import { BODY_LIMIT_BYTES } from "./config";

/** Field name (dotted path) → messages, for form errors. */
export type FieldErrors = Record<string, string[]>;

export interface ErrorBody {
  error: { code: string; message: string; fields?: FieldErrors };
}

/** Headers of every JSON answer (the fast lanes send the same). */
export const JSON_HEADERS = { "content-type": "application/json; charset=utf-8", "cache-control": "no-store" };

/**
 * A JSON response.
 * @example return json({ id: groove.id }, 201);
 */
export function json(data: unknown, status = 200, headers: HeadersInit = {}): Response {
  return new Response(JSON.stringify(data), { status, headers: { ...JSON_HEADERS, ...Object.fromEntries(new Headers(headers)) } });
}

/**
 * An error response in the one shape every route uses.
 * @example return error(404, "not_found", "No groove has this id.");
 */
export function error(status: number, code: string, message: string, fields?: FieldErrors, headers: HeadersInit = {}): Response {
  const body: ErrorBody = { error: fields && Object.keys(fields).length > 0 ? { code, message, fields } : { code, message } };
  return json(body, status, headers);
}

/** Turns zod issues into { "path.to.field": [messages] } ("_" for the body itself). */
export function fieldErrors(issues: readonly z.core.$ZodIssue[]): FieldErrors {
  const fields: FieldErrors = {};
  for (const issue of issues) {
    const key = issue.path.length > 0 ? issue.path.map(String).join(".") : "_";
    (fields[key] ??= []).push(issue.message);
  }
  return fields;
}

export type ParseResult<T> = { ok: true; data: T } | { ok: false; response: Response };

/**
 * Reads a JSON body and validates it with a zod schema. On failure it returns the error Response to send:
 * 413 over the size limit, 415 when the body is not JSON, 400 on malformed JSON or failed validation (with fields).
 * @example
 * const parsed = await parseBody(request, CreateGroove);
 * if (!parsed.ok) return parsed.response;
 * const input = parsed.data;
 */
export async function parseBody<S extends z.ZodType>(
  request: Request,
  schema: S,
  { limitBytes = BODY_LIMIT_BYTES }: { limitBytes?: number } = {},
): Promise<ParseResult<z.output<S>>> {
  const tooLarge = (): ParseResult<never> => ({
    ok: false,
    response: error(413, "payload_too_large", `The request body is larger than ${limitBytes} bytes.`),
  });
  const declared = Number(request.headers.get("content-length"));
  if (Number.isFinite(declared) && declared > limitBytes) return tooLarge();
  const type = request.headers.get("content-type") ?? "";
  if (type && !/^application\/([\w.+-]+\+)?json\b/i.test(type)) {
    return { ok: false, response: error(415, "unsupported_media_type", "Send the body as JSON (content-type: application/json).") };
  }
  // Read the stream with a running count: content-length can be absent or wrong.
  let text = "";
  if (request.body) {
    const reader = request.body.getReader();
    const decoder = new TextDecoder();
    let size = 0;
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      size += value.byteLength;
      if (size > limitBytes) {
        await reader.cancel().catch(() => {});
        return tooLarge();
      }
      text += decoder.decode(value, { stream: true });
    }
    text += decoder.decode();
  }
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch {
    return {
      ok: false,
      response: error(400, "invalid_json", text.trim() === "" ? "The request body is empty: send a JSON object." : "The request body is not valid JSON."),
    };
  }
  const result = schema.safeParse(raw);
  if (!result.success) {
    return { ok: false, response: error(400, "invalid_input", "Some fields are not valid.", fieldErrors(result.error.issues)) };
  }
  return { ok: true, data: result.data };
}
