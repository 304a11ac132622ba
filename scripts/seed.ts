// `tsx scripts/seed.ts`: seeds the demo users and grooves into DATABASE_URL. Idempotent: fixed ids, and rows
// that already exist are left as they are (a demo user who changed a password keeps it).
import { createHash } from "node:crypto";
import canonicalize from "canonicalize";
import { eq, inArray } from "drizzle-orm";
import { DEMO_GROOVES } from "../src/lib/demo/grooves";
import { DEMO_USERS } from "../src/lib/demo/people";
import { assertGroove } from "../src/lib/rhythm/document";
import { hashPassword } from "../src/lib/server/password";
import { closeDb, getDb } from "../src/lib/server/db/index";
import { auditEvents, grooveVersions, grooves, users } from "../src/lib/server/db/schema";

/** SHA-256 of the RFC 8785 canonical JSON of a document. */
function contentHash(document: unknown): string {
  return createHash("sha256").update(canonicalize(document) ?? "").digest("hex");
}

async function seed(): Promise<{ users: number; grooves: number }> {
  const db = getDb();
  let newUsers = 0;
  let newGrooves = 0;
  const existingUsers = new Set(
    (await db.select({ id: users.id }).from(users).where(inArray(users.id, DEMO_USERS.map((u) => u.id)))).map((r) => r.id),
  );
  for (const user of DEMO_USERS) {
    if (existingUsers.has(user.id)) continue;
    const inserted = await db
      .insert(users)
      .values({
        id: user.id,
        email: user.email.toLowerCase(),
        displayName: user.displayName,
        passwordHash: await hashPassword(user.password), // argon2id, m=19456 KiB, t=2, p=1
        siteRole: user.siteRole,
        emailVerifiedAt: new Date(),
      })
      .onConflictDoNothing()
      .returning({ id: users.id });
    newUsers += inserted.length;
  }

  for (const demo of DEMO_GROOVES) {
    const document = assertGroove(demo.document);
    await db.transaction(async (tx) => {
      const created = await tx
        .insert(grooves)
        .values({
          id: demo.id,
          ownerId: demo.ownerId,
          title: demo.title,
          description: demo.description,
          tags: [...demo.tags],
          visibility: demo.visibility,
        })
        .onConflictDoNothing()
        .returning({ id: grooves.id });
      if (created.length === 0) return;
      newGrooves++;
      await tx
        .insert(grooveVersions)
        .values({
          id: demo.versionId,
          grooveId: demo.id,
          number: 1,
          document,
          contentHash: contentHash(document),
          authorId: demo.ownerId,
          message: demo.message,
        })
        .onConflictDoNothing();
      await tx.update(grooves).set({ latestVersionId: demo.versionId }).where(eq(grooves.id, demo.id));
      await tx.insert(auditEvents).values({
        actorId: demo.ownerId,
        action: "groove.seeded",
        grooveId: demo.id,
        versionId: demo.versionId,
        details: { source: "demo seed" },
      });
    });
  }
  return { users: newUsers, grooves: newGrooves };
}

try {
  const added = await seed();
  console.log(`tactus: demo data ready (${added.users} new users, ${added.grooves} new grooves)`);
} catch (error) {
  const message = error instanceof Error ? error.message : String(error);
  console.error(`tactus: error: could not seed the demo data: ${message}`);
  process.exitCode = 1;
} finally {
  await closeDb();
}
