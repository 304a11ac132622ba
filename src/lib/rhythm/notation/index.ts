/** Notation spelling: groove document → renderer-neutral notation model (see model.ts for its conventions). */
export * from "./model";
export { spellGroove, spellBars } from "./spell";
export { KIT_STAFF, kitDisplay, kitVoice, staffIndex, type KitStaffEntry, type KitSource } from "./kit-staff";
export { spellMidi, chooseAccidentals, type Accidentals, type SpelledPitch } from "./pitch-spelling";
export { valueLength, noteValueOf } from "./durations";
export { isBeamable } from "./beams";
