// Saving a version as an HTTP request asks for it: the body read and validated (zod, then the core's parseGroove),
// the version appended, and the answer (201, or the error in the one shape). One implementation for the Astro route
// (src/pages/api/grooves/[id]/versions/index.ts) and its fast lane (save-fast-lane.ts).
import { z } from "zod";
import { parseGroove } from "../rhythm/document";
import { idSchema } from "./grooves";
import { error, json, parseBody } from "./http";
import type { SessionUser } from "./session";
import { MAX_DOCUMENT_BYTES, saveVersion } from "./versions";

export const SaveSchema = z.object({
  baseVersionId: idSchema,
  document: z.unknown().refine((v) => v !== undefined, "Send the groove document."),
  message: z.string().trim().max(500, "Use at most 500 characters.").default(""),
});

/**
 * Appends the version a save request carries. ApiErrors (401/403/404/409) are thrown for the caller's error handling;
 * body and document problems come back as their 4xx response.
 * @example return saveFromRequest(requireUser(ctx), idParam(ctx, "id"), ctx.request);
 */
export async function saveFromRequest(user: SessionUser, grooveId: string, request: Request): Promise<Response> {
  const parsed = await parseBody(request, SaveSchema, { limitBytes: MAX_DOCUMENT_BYTES });
  if (!parsed.ok) return parsed.response;
  const doc = parseGroove(parsed.data.document);
  if (!doc.ok) {
    return error(400, "invalid_document", "The groove document is not valid.", Object.fromEntries(doc.issues.map((i) => [i.path ? `document.${i.path}` : "document", [i.message]])));
  }
  const version = await saveVersion(user, grooveId, { baseVersionId: parsed.data.baseVersionId, document: doc.doc, message: parsed.data.message });
  return json(version, 201, { location: `/api/grooves/${grooveId}/versions/${version.id}` });
}
