// POST /api/grooves/:id/fork { title?, versionId? } → 201 a new private groove owned by the caller, starting from the
// latest version (or versionId). Anyone signed in who may read the groove may fork it.
import type { APIRoute } from "astro";
import { z } from "zod";
import { forkGroove, idSchema, titleSchema } from "../../../../lib/server/grooves";
import { json, parseBody } from "../../../../lib/server/http";
import { idParam, requireUser, route } from "../../../../lib/server/route";

// Strict: every field is optional, so an unknown key is more likely a mistake than a wish for defaults.
const Fork = z.strictObject({ title: titleSchema.optional(), versionId: idSchema.optional() });

export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const id = idParam(ctx, "id");
  const hasBody = ctx.request.headers.get("content-length") !== "0" && ctx.request.body !== null;
  let input: z.output<typeof Fork> = {};
  if (hasBody) {
    const parsed = await parseBody(ctx.request, Fork);
    if (!parsed.ok) return parsed.response;
    input = parsed.data;
  }
  const groove = await forkGroove(user, id, input);
  return json(groove, 201, { location: `/api/grooves/${groove.id}` });
}) satisfies APIRoute;
