/** Tactus rhythm core: pure TypeScript, no framework imports. Everything public is re-exported here. */
export * from "./rational";
export * from "./kit";
export * from "./document";
export * from "./readability";
export * from "./notation";
