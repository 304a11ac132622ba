// Accounts over HTTP against the built server and its PostgreSQL: sign-up, sessions (cookie attributes, rotation,
// idle and absolute expiry, hashed storage), e-mail confirmation, password reset, throttling, disabled accounts and
// cross-origin refusals. Mail goes to the local capture server and is read back through the dev mailbox.
import { afterAll, describe, expect, it } from "vitest";
import { recordSignInFailure, LIMITS } from "../../src/lib/server/rate-limit";
import { closeDb as closeAppDb } from "../../src/lib/server/db/index";
import { SESSION_REMEMBER_MS } from "../../src/lib/server/session";
import { PASSWORD, api, closeDb, createUser, db, errorOf, mailbox, sessionFor, sessionFrom, sha256, tokenFromMail, uid } from "./helpers";

afterAll(async () => {
  await closeDb();
  await closeAppDb();
});

const newEmail = (label: string) => `${label}-${uid(8).toLowerCase()}@lamplight-ferry.test`;

describe("sign-up and sessions", () => {
  it("creates an account, signs it in with a HttpOnly, SameSite=Lax, Secure cookie and stores only the token's hash", async () => {
    const email = newEmail("Signup").replace("signup", "SignUp");
    const r = await api("POST", "/api/auth/sign-up", { body: { email, password: "the ferry leaves at nine", displayName: "Mara Quill" } });
    expect(r.status).toBe(201);
    expect(r.body.user.email).toBe(email.toLowerCase());
    expect(r.body.user.emailVerified).toBe(false);
    expect(r.body.user).not.toHaveProperty("passwordHash");
    const cookie = r.headers.getSetCookie().find((c) => c.startsWith("tactus_session="))!;
    expect(cookie).toMatch(/; HttpOnly/i);
    expect(cookie).toMatch(/; SameSite=Lax/i);
    expect(cookie).toMatch(/; Secure/i); // the built server is not development
    expect(cookie).toMatch(/; Path=\//);
    const token = sessionFrom(r)!;
    const rows = (await db().query("select id from sessions where user_id = $1", [r.body.user.id])).rows;
    expect(rows.map((x) => x.id)).toEqual([sha256(token)]);
    const me = await api("GET", "/api/auth/me", { cookie: token });
    expect(me.status).toBe(200);
    expect(me.body.user.id).toBe(r.body.user.id);
    // The password is stored as an argon2id PHC string with the OWASP parameters (m=19456, t=2, p=1).
    const hash = (await db().query("select password_hash from users where id = $1", [r.body.user.id])).rows[0].password_hash;
    expect(hash).toMatch(/^\$argon2id\$v=19\$m=19456,t=2,p=1\$/);
  });

  it("refuses short and common passwords with a field message (OWASP ASVS 2.1.1, 2.1.7), and a taken address with 409", async () => {
    const short = await api("POST", "/api/auth/sign-up", { body: { email: newEmail("short"), password: "seven77", displayName: "A" } });
    expect(short.status).toBe(400);
    expect(errorOf(short).fields?.password?.[0]).toMatch(/at least 8/);
    const common = await api("POST", "/api/auth/sign-up", { body: { email: newEmail("common"), password: "Password1", displayName: "A" } });
    expect(common.status).toBe(400);
    expect(errorOf(common).fields?.password?.[0]).toMatch(/too common/);
    const user = await createUser();
    const taken = await api("POST", "/api/auth/sign-up", { body: { email: user.email.toUpperCase(), password: "a long enough phrase", displayName: "A" } });
    expect(taken.status).toBe(409);
    expect(errorOf(taken).code).toBe("email_taken");
  });

  it("rotates the session on sign-in: the browser's earlier session ends", async () => {
    const user = await createUser();
    const before = await sessionFor(user.id);
    const r = await api("POST", "/api/auth/sign-in", { cookie: before, body: { email: user.email, password: PASSWORD } });
    expect(r.status).toBe(200);
    const after = sessionFrom(r)!;
    expect(after).not.toBe(before);
    expect((await api("GET", "/api/auth/me", { cookie: before })).status).toBe(401);
    expect((await api("GET", "/api/auth/me", { cookie: after })).status).toBe(200);
  });

  it("ends a session after the idle period (expires_at passed) and after the absolute lifetime (30 days)", async () => {
    const user = await createUser();
    const idle = await sessionFor(user.id);
    await db().query("update sessions set expires_at = now() - interval '1 second' where id = $1", [sha256(idle)]);
    const r1 = await api("GET", "/api/auth/me", { cookie: idle });
    expect(r1.status).toBe(401);
    expect(r1.headers.getSetCookie().some((c) => /^tactus_session=;/.test(c) || /^tactus_session=.*Max-Age=0/i.test(c))).toBe(true);

    const old = await sessionFor(user.id);
    // Still within its idle window, but created 31 days ago.
    await db().query("update sessions set created_at = now() - interval '31 days' where id = $1", [sha256(old)]);
    expect((await api("GET", "/api/auth/me", { cookie: old })).status).toBe(401);
    expect((await db().query("select 1 from sessions where id = $1", [sha256(old)])).rowCount).toBe(0);

    const fresh = await sessionFor(user.id);
    expect((await api("GET", "/api/auth/me", { cookie: fresh })).status).toBe(200);
  });

  it("extends a session used in the second half of its idle period and sends the cookie again", async () => {
    const user = await createUser();
    const token = await sessionFor(user.id);
    await db().query("update sessions set expires_at = now() + interval '1 day' where id = $1", [sha256(token)]);
    const r = await api("GET", "/api/auth/me", { cookie: token });
    expect(r.status).toBe(200);
    expect(sessionFrom(r)).toBe(token);
    const exp = (await db().query("select expires_at from sessions where id = $1", [sha256(token)])).rows[0].expires_at as Date;
    expect(exp.getTime()).toBeGreaterThan(Date.now() + 6 * 24 * 3600_000);
  });

  it("remembers a validated session for at most SESSION_REMEMBER_MS, and forgets it at once when Tactus ends it", async () => {
    const user = await createUser();
    // Used (so remembered), then signed out: refused by the very next request.
    const a = await sessionFor(user.id);
    expect((await api("GET", "/api/auth/me", { cookie: a })).status).toBe(200);
    expect((await api("POST", "/api/auth/sign-out", { cookie: a })).status).toBe(204);
    expect((await api("GET", "/api/auth/me", { cookie: a })).status).toBe(401);
    // Used, then promoted by an admin: the new site role is seen by the very next request.
    const b = await sessionFor(user.id);
    expect((await api("GET", "/api/admin/users", { cookie: b })).status).toBe(403);
    const admin = await createUser({ siteRole: "admin" });
    expect((await api("PATCH", `/api/admin/users/${user.id}`, { cookie: await sessionFor(admin.id), body: { siteRole: "admin" } })).status).toBe(200);
    expect((await api("GET", "/api/admin/users", { cookie: b })).status).toBe(200);
    // Deleted by SQL outside Tactus: still accepted from memory for a moment, refused once SESSION_REMEMBER_MS passed.
    const c = await sessionFor(user.id);
    expect((await api("GET", "/api/auth/me", { cookie: c })).status).toBe(200);
    await db().query("delete from sessions where id = $1", [sha256(c)]);
    await new Promise((r) => setTimeout(r, SESSION_REMEMBER_MS + 100));
    expect((await api("GET", "/api/auth/me", { cookie: c })).status).toBe(401);
  });

  it("looks a busy remembered session up again before it lapses (the list fast lane keeps answering)", async () => {
    const user = await createUser();
    const token = await sessionFor(user.id);
    const list = () => api("GET", "/api/grooves?scope=mine&pageSize=1", { cookie: token });
    expect((await list()).status).toBe(200); // through Astro: validated and remembered
    await new Promise((r) => setTimeout(r, SESSION_REMEMBER_MS - 300)); // inside the last 500 ms
    expect((await list()).headers.get("content-length")).not.toBeNull(); // the lane, which starts the lookup
    await new Promise((r) => setTimeout(r, 500)); // past the first lifetime
    expect((await list()).headers.get("content-length")).not.toBeNull(); // still the lane: looked up again
  });

  it("signs out: the session row is gone and the cookie cleared", async () => {
    const user = await createUser();
    const token = await sessionFor(user.id);
    const r = await api("POST", "/api/auth/sign-out", { cookie: token });
    expect(r.status).toBe(204);
    expect((await db().query("select 1 from sessions where id = $1", [sha256(token)])).rowCount).toBe(0);
    expect((await api("GET", "/api/auth/me", { cookie: token })).status).toBe(401);
  });
});

describe("e-mail confirmation", () => {
  it("sends a link on sign-up; the token confirms the address once", async () => {
    const email = newEmail("verify");
    const r = await api("POST", "/api/auth/sign-up", { body: { email, password: "ferry lanterns glow", displayName: "Ves" } });
    expect(r.status).toBe(201);
    const token = await tokenFromMail(email, /Confirm your e-mail/);
    const mail = (await mailbox(email))[0]!;
    expect(mail.text).toContain("/verify?token=");
    const ok = await api("POST", "/api/auth/verify-email", { body: { token } });
    expect(ok.status).toBe(200);
    const me = await api("GET", "/api/auth/me", { cookie: sessionFrom(r) });
    expect(me.body.user.emailVerified).toBe(true);
    const again = await api("POST", "/api/auth/verify-email", { body: { token } });
    expect(again.status).toBe(400);
    expect(errorOf(again).code).toBe("invalid_token");
  });
});

describe("password reset", () => {
  it("mails a single-use link; the reset ends every session; the new password works and the old one not", async () => {
    const user = await createUser({ label: "reset" });
    const other = await sessionFor(user.id);
    const req = await api("POST", "/api/auth/reset-request", { body: { email: user.email } });
    expect(req.status).toBe(202);
    const token = await tokenFromMail(user.email, /Reset your Tactus password/);
    const weak = await api("POST", "/api/auth/reset-password", { body: { token, password: "12345678" } });
    expect(weak.status).toBe(400);
    const done = await api("POST", "/api/auth/reset-password", { body: { token, password: "a brand new timetable" } });
    expect(done.status).toBe(200);
    expect((await api("GET", "/api/auth/me", { cookie: other })).status).toBe(401);
    expect((await api("GET", "/api/auth/me", { cookie: sessionFrom(done) })).status).toBe(200);
    const reuse = await api("POST", "/api/auth/reset-password", { body: { token, password: "yet another timetable" } });
    expect(reuse.status).toBe(400);
    expect((await api("POST", "/api/auth/sign-in", { body: { email: user.email, password: PASSWORD } })).status).toBe(401);
    expect((await api("POST", "/api/auth/sign-in", { body: { email: user.email, password: "a brand new timetable" } })).status).toBe(200);
  });

  it("refuses an expired link, and answers 202 without mail for an unknown address", async () => {
    const user = await createUser({ label: "expired" });
    expect((await api("POST", "/api/auth/reset-request", { body: { email: user.email } })).status).toBe(202);
    const token = await tokenFromMail(user.email, /Reset your Tactus password/);
    await db().query("update email_tokens set expires_at = now() - interval '1 second' where token_hash = $1", [sha256(token)]);
    const r = await api("POST", "/api/auth/reset-password", { body: { token, password: "a brand new timetable" } });
    expect(r.status).toBe(400);
    expect(errorOf(r).code).toBe("invalid_token");

    const nobody = newEmail("nobody");
    expect((await api("POST", "/api/auth/reset-request", { body: { email: nobody } })).status).toBe(202);
    await new Promise((res) => setTimeout(res, 300));
    expect(await mailbox(nobody)).toEqual([]);
  });
});

describe("sign-in throttling (rate-limiter-flexible, PostgreSQL store)", () => {
  it("slows down after 3 failures with 429 + Retry-After, then lets a correct password through once the wait is over", async () => {
    const user = await createUser({ label: "throttle" });
    const wrong = { email: user.email, password: "not the password" };
    for (let i = 0; i < 3; i++) expect((await api("POST", "/api/auth/sign-in", { body: wrong })).status).toBe(401);
    const slowed = await api("POST", "/api/auth/sign-in", { body: { email: user.email, password: PASSWORD } });
    expect(slowed.status).toBe(429);
    expect(errorOf(slowed).code).toBe("rate_limited");
    const retry = Number(slowed.headers.get("retry-after"));
    expect(retry).toBeGreaterThanOrEqual(1);
    expect(slowed.body.retryAfterSeconds).toBe(retry);
    await new Promise((res) => setTimeout(res, retry * 1000 + 100));
    expect((await api("POST", "/api/auth/sign-in", { body: { email: user.email, password: PASSWORD } })).status).toBe(200);
  });

  it("locks an account after many failures from other addresses too (per-account limit)", async () => {
    const user = await createUser({ label: "locked" });
    // Failures recorded through the same store the server uses, as if from many addresses of a documentation range.
    for (let i = 0; i <= LIMITS.signInFailuresAccount.points; i++) await recordSignInFailure(user.email, `203.0.113.${i % 250}`);
    const r = await api("POST", "/api/auth/sign-in", { body: { email: user.email, password: PASSWORD } });
    expect(r.status).toBe(429);
    expect(Number(r.headers.get("retry-after"))).toBeGreaterThan(600);
    // Another account from this address is not affected.
    const other = await createUser();
    expect((await api("POST", "/api/auth/sign-in", { body: { email: other.email, password: PASSWORD } })).status).toBe(200);
  });
});

describe("disabled accounts", () => {
  it("end their sessions at once and cannot sign in", async () => {
    const admin = await createUser({ siteRole: "admin" });
    const user = await createUser({ label: "disabled" });
    const s1 = await sessionFor(user.id);
    const s2 = await sessionFor(user.id);
    expect((await api("GET", "/api/auth/me", { cookie: s1 })).status).toBe(200);
    const r = await api("PATCH", `/api/admin/users/${user.id}`, { cookie: await sessionFor(admin.id), body: { disabled: true } });
    expect(r.status).toBe(200);
    expect(r.body.disabled).toBe(true);
    expect((await db().query("select count(*)::int as n from sessions where user_id = $1", [user.id])).rows[0].n).toBe(0);
    expect((await api("GET", "/api/auth/me", { cookie: s1 })).status).toBe(401);
    expect((await api("GET", "/api/auth/me", { cookie: s2 })).status).toBe(401);
    const signIn = await api("POST", "/api/auth/sign-in", { body: { email: user.email, password: PASSWORD } });
    expect(signIn.status).toBe(403);
    expect(errorOf(signIn).code).toBe("account_disabled");
    // A session row slipped in afterwards is refused too (validation checks the account).
    const s3 = await sessionFor(user.id);
    expect((await api("GET", "/api/auth/me", { cookie: s3 })).status).toBe(401);
  });

  it("admins list and search users, change roles, and cannot disable themselves", async () => {
    const admin = await createUser({ siteRole: "admin", label: "boss" });
    const cookie = await sessionFor(admin.id);
    const user = await createUser({ label: "findme" });
    const list = await api("GET", `/api/admin/users?q=${encodeURIComponent(user.email.slice(0, 14))}`, { cookie });
    expect(list.status).toBe(200);
    expect(list.body.items.map((u: { id: string }) => u.id)).toContain(user.id);
    const promoted = await api("PATCH", `/api/admin/users/${user.id}`, { cookie, body: { siteRole: "admin" } });
    expect(promoted.body.siteRole).toBe("admin");
    expect((await api("GET", "/api/admin/users", { cookie: await sessionFor(user.id) })).status).toBe(200);
    const self = await api("PATCH", `/api/admin/users/${admin.id}`, { cookie, body: { disabled: true } });
    expect(self.status).toBe(409);
    const audit = await db().query("select action from audit_events where actor_id = $1 order by id", [admin.id]);
    expect(audit.rows.map((r) => r.action)).toContain("user.role_changed");
  });
});

describe("cross-origin writes are refused", () => {
  it("refuses a cross-site form post (Astro's origin check) and a cross-site JSON post (ours)", async () => {
    const user = await createUser();
    const cookie = await sessionFor(user.id);
    const form = await api("POST", "/api/auth/sign-out", {
      cookie,
      raw: "x=1",
      headers: { "content-type": "application/x-www-form-urlencoded", origin: "http://evil.example" },
    });
    expect(form.status).toBe(403);
    const jsonPost = await api("POST", "/api/grooves", { cookie, body: { title: "csrf" }, headers: { origin: "http://evil.example" } });
    expect(jsonPost.status).toBe(403);
    expect(errorOf(jsonPost).code).toBe("cross_origin");
    const fetchSite = await api("POST", "/api/grooves", { cookie, body: { title: "csrf" }, headers: { "sec-fetch-site": "cross-site" } });
    expect(fetchSite.status).toBe(403);
    // Nothing was created, and the session still works.
    expect((await db().query("select count(*)::int as n from grooves where owner_id = $1", [user.id])).rows[0].n).toBe(0);
    expect((await api("GET", "/api/auth/me", { cookie })).status).toBe(200);
    // The same request from the site's own origin goes through.
    const host = new URL(process.env.TEST_BASE_URL!).host;
    const same = await api("POST", "/api/grooves", { cookie, body: { title: "same origin" }, headers: { origin: `http://${host}`, "sec-fetch-site": "same-origin" } });
    expect(same.status).toBe(201);
  });
});
