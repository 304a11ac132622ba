// The password rules and hashing, and the authorisation rules, checked directly (no server needed).
// Sources (from memory, not re-read here): OWASP Password Storage Cheat Sheet (argon2id, m=19456 KiB, t=2, p=1);
// NIST SP 800-63B 5.1.1.2 (at least 8 characters, compare with lists of commonly used passwords, no composition
// rules); OWASP ASVS 4.0.3 V2.1.7 and V2.1.9 say the same about lists and composition.
import { describe, expect, it } from "vitest";
import { ARGON2_OPTIONS, hashPassword, isCommonPassword, passwordProblem, verifyPassword } from "../../src/lib/server/password";
import { can, grooveRole, refusalStatus, type Actor, type GrooveAction, type GrooveFacts } from "../../src/lib/server/roles";

describe("passwords", () => {
  it("hashes with argon2id at the OWASP parameters and verifies", async () => {
    expect(ARGON2_OPTIONS).toMatchObject({ memoryCost: 19456, timeCost: 2, parallelism: 1 });
    const hash = await hashPassword("lanterns on the quay");
    expect(hash).toMatch(/^\$argon2id\$v=19\$m=19456,t=2,p=1\$[A-Za-z0-9+/]+\$[A-Za-z0-9+/]+$/);
    expect(await verifyPassword(hash, "lanterns on the quay")).toBe(true);
    expect(await verifyPassword(hash, "lanterns on the quay ")).toBe(false);
    expect(await verifyPassword("not a hash", "x")).toBe(false);
    // Two hashes of one password differ (random salt).
    expect(await hashPassword("lanterns on the quay")).not.toBe(hash);
  });

  it("asks for 8+ characters, no composition rules, and refuses common passwords from the shipped list", () => {
    expect(passwordProblem("seven77")).toMatch(/at least 8/);
    expect(passwordProblem("ééééééé")).toMatch(/at least 8/); // code points, not bytes
    expect(passwordProblem("aaaa bbbb")).toBeNull(); // no composition rules
    expect(passwordProblem("all lowercase words")).toBeNull();
    // Well-known entries of every published common-password list.
    for (const p of ["password", "12345678", "qwertyuiop", "iloveyou", "PASSWORD", "Password1"]) {
      if (p.length >= 8) expect(isCommonPassword(p), p).toBe(true);
    }
    expect(passwordProblem("baseball")).toMatch(/too common/);
    expect(passwordProblem("ana@example.com", { email: "ana@example.com" })).toMatch(/e-mail/);
    expect(passwordProblem("x".repeat(257))).toMatch(/at most/);
  });
});

describe("authorisation rules", () => {
  const owner: Actor = { id: "u-owner", siteRole: "member" };
  const editor: Actor = { id: "u-editor", siteRole: "member" };
  const viewer: Actor = { id: "u-viewer", siteRole: "member" };
  const other: Actor = { id: "u-other", siteRole: "member" };
  const admin: Actor = { id: "u-admin", siteRole: "admin" };
  const facts = (actor: Actor | null, visibility: GrooveFacts["visibility"]): GrooveFacts => ({
    ownerId: owner.id,
    visibility,
    collaboratorRole: actor === editor ? "editor" : actor === viewer ? "viewer" : null,
  });
  const actors: Array<[string, Actor | null]> = [
    ["anonymous", null],
    ["viewer", viewer],
    ["editor", editor],
    ["owner", owner],
    ["other", other],
    ["admin", admin],
  ];
  // Expected permissions on a PRIVATE groove, one row per action, columns in the order of `actors`.
  const privateTable: Record<GrooveAction, boolean[]> = {
    read: [false, true, true, true, false, true],
    fork: [false, true, true, true, false, true],
    edit: [false, false, true, true, false, false],
    share: [false, false, false, true, false, false],
    delete: [false, false, false, true, false, true],
    seeCollaborators: [false, true, true, true, false, true],
  };
  for (const [action, expected] of Object.entries(privateTable) as Array<[GrooveAction, boolean[]]>) {
    it(`private groove, ${action}: ${expected.map((e, i) => `${actors[i]![0]}=${e}`).join(" ")}`, () => {
      expect(actors.map(([, a]) => can(a, action, facts(a, "private")))).toEqual(expected);
    });
  }

  it("public and link grooves can be read by anyone and forked by anyone signed in; nothing else opens up", () => {
    for (const visibility of ["public", "link"] as const) {
      expect(can(null, "read", facts(null, visibility))).toBe(true);
      expect(can(null, "fork", facts(null, visibility))).toBe(false);
      expect(can(other, "fork", facts(other, visibility))).toBe(true);
      expect(can(other, "edit", facts(other, visibility))).toBe(false);
      expect(can(other, "seeCollaborators", facts(other, visibility))).toBe(false);
    }
  });

  it("maps refusals to 404 (cannot read), 401 (anonymous) and 403 (can read, may not act)", () => {
    expect(refusalStatus(other, "edit", facts(other, "private"))).toBe(404);
    expect(refusalStatus(null, "fork", facts(null, "public"))).toBe(401);
    expect(refusalStatus(viewer, "edit", facts(viewer, "private"))).toBe(403);
    expect(grooveRole(owner, facts(owner, "private"))).toBe("owner");
    expect(grooveRole(admin, facts(admin, "private"))).toBeNull();
  });
});
