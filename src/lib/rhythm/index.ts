/** Tactus rhythm core: pure TypeScript, no framework imports. Everything public is re-exported here. */
export * from "./rational";
export * from "./kit";
export * from "./document";
export * from "./readability";
export * from "./notation";
export * from "./meter";
export * from "./swing";
export * from "./transforms";
export * from "./schedule";
export * from "./equivalence";
export * from "./describe-position";
export * from "./readings";
export * from "./editing";
export * from "./tap-tempo";
export * from "./sections";
export * from "./playback-plan";
export * from "./onsets";
