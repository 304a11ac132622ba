/**
 * The kit pieces a groove can use: our ids, plain names for the interface, the limb that plays them,
 * and their General MIDI Level 1 percussion key (channel 10).
 *
 * GM notes from the General MIDI System Level 1 percussion key map (MMA, RP003), as listed in the
 * project's reference notes. Staff positions and noteheads live with the notation code, not here.
 */

export const KIT_PIECE_IDS = [
  "kick",
  "snare",
  "cross-stick",
  "hihat-closed",
  "hihat-open",
  "hihat-foot",
  "ride",
  "ride-bell",
  "crash",
  "tom-high",
  "tom-mid",
  "tom-floor",
  "clap",
  "tambourine",
  "cowbell",
] as const;

export type KitPieceId = (typeof KIT_PIECE_IDS)[number];

/**
 * Index of each piece in KIT_PIECE_IDS: the one fixed order of kit pieces for sorting simultaneous events
 * (schedule, equivalence, reports) and for compact sound codes.
 * @example KIT_PIECE_INDEX.get("snare") // 1
 */
export const KIT_PIECE_INDEX: ReadonlyMap<KitPieceId, number> = new Map(KIT_PIECE_IDS.map((id, i) => [id, i]));

export type Limb = "hand" | "foot";

export interface KitPiece {
  readonly id: KitPieceId;
  /** Short name shown on the grid row. */
  readonly name: string;
  readonly limb: Limb;
  /** General MIDI Level 1 percussion key number. */
  readonly gmNote: number;
}

/** Lookup table, in the order rows are offered in the editor (cymbals, drums, feet, hand percussion). */
export const KIT_PIECES: Readonly<Record<KitPieceId, KitPiece>> = {
  crash: { id: "crash", name: "Crash", limb: "hand", gmNote: 49 },
  ride: { id: "ride", name: "Ride", limb: "hand", gmNote: 51 },
  "ride-bell": { id: "ride-bell", name: "Ride bell", limb: "hand", gmNote: 53 },
  "hihat-closed": { id: "hihat-closed", name: "Hi-hat", limb: "hand", gmNote: 42 },
  "hihat-open": { id: "hihat-open", name: "Open hi-hat", limb: "hand", gmNote: 46 },
  "tom-high": { id: "tom-high", name: "High tom", limb: "hand", gmNote: 50 },
  "tom-mid": { id: "tom-mid", name: "Mid tom", limb: "hand", gmNote: 47 },
  snare: { id: "snare", name: "Snare", limb: "hand", gmNote: 38 },
  "cross-stick": { id: "cross-stick", name: "Cross-stick", limb: "hand", gmNote: 37 },
  "tom-floor": { id: "tom-floor", name: "Floor tom", limb: "hand", gmNote: 43 },
  kick: { id: "kick", name: "Kick", limb: "foot", gmNote: 36 },
  "hihat-foot": { id: "hihat-foot", name: "Hi-hat foot", limb: "foot", gmNote: 44 },
  clap: { id: "clap", name: "Clap", limb: "hand", gmNote: 39 },
  tambourine: { id: "tambourine", name: "Tambourine", limb: "hand", gmNote: 54 },
  cowbell: { id: "cowbell", name: "Cowbell", limb: "hand", gmNote: 56 },
};

/** Row order for the editor and the legend. */
export const KIT_ROW_ORDER: readonly KitPieceId[] = Object.keys(KIT_PIECES) as KitPieceId[];

/** Dynamics a kit hit can carry, softest first. */
export const DYNAMICS = ["ghost", "normal", "accent"] as const;
export type Dynamic = (typeof DYNAMICS)[number];

/** MIDI velocity for each dynamic (common practice: ghost notes soft, accents near the top of the range). */
export const DYNAMIC_VELOCITY: Readonly<Record<Dynamic, number>> = { ghost: 40, normal: 90, accent: 120 };

/** Articulations a kit hit can carry. */
export const ARTICULATIONS = ["flam", "open", "choke"] as const;
export type Articulation = (typeof ARTICULATIONS)[number];
