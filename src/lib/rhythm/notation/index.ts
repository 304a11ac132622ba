/** Notation spelling: groove document → renderer-neutral notation model. */
export * from "./model";
