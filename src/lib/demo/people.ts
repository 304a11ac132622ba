/**
 * Invented people for the demo scenario: the band "The Lamplight Ferry" and the transcriber who writes for them.
 * The passwords are public demo passwords (also listed in the README): never reuse them for real accounts.
 */
export interface DemoUser {
  readonly id: string;
  readonly email: string;
  readonly displayName: string;
  readonly siteRole: "admin" | "member";
  /** Demo password, documented in the README. */
  readonly password: string;
}

/** Site administrator of the demo install. */
export const DEMO_ADMIN: DemoUser = {
  id: "usr_demo_admin",
  email: "admin@lamplight-ferry.test",
  displayName: "Ines Calloway",
  siteRole: "admin",
  password: "ferry-admin-demo",
};

/** The band's drummer, who owns the demo grooves. */
export const DEMO_DRUMMER: DemoUser = {
  id: "usr_demo_drummer",
  email: "odile@lamplight-ferry.test",
  displayName: "Odile Marsh",
  siteRole: "member",
  password: "ferry-drums-demo",
};

export const DEMO_USERS: readonly DemoUser[] = [DEMO_ADMIN, DEMO_DRUMMER];
