/** Readability measures: metrical weights, published syncopation measures, and figures for a document. */
export * from "./metrical-weights";
export * from "./syncopation";
export * from "./figures";
