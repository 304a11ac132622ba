/** Renotation transforms that keep the sound: rescale, displace, re-bar. */
export * from "./rescale";
export * from "./displace";
export * from "./rebar";
export * from "./grid";
