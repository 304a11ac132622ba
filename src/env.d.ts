/// <reference types="astro/client" />

declare namespace App {
  interface Locals {
    /** The signed-in user (filled by src/middleware.ts), or null. */
    user: import("./lib/server/session").SessionUser | null;
    /** The current session, or null. */
    session: import("./lib/server/session").SessionInfo | null;
  }
}
