/**
 * General MIDI Level 1 percussion key map (channel 10), and how Tactus reads keys its kit has no piece for.
 *
 * Names of keys 35–57 and 59: General MIDI System Level 1 (MMA, RP003), as listed in the project's reference
 * notes (verified). Keys 58 and 60–81 complete the GM1 map from memory (not checked against the source).
 */
import { KIT_PIECES, KIT_PIECE_IDS, type KitPieceId } from "../rhythm/kit";

/** GM1 percussion names by key number (35–81). */
export const GM1_PERCUSSION: Readonly<Record<number, string>> = {
  35: "Acoustic Bass Drum",
  36: "Bass Drum 1",
  37: "Side Stick",
  38: "Acoustic Snare",
  39: "Hand Clap",
  40: "Electric Snare",
  41: "Low Floor Tom",
  42: "Closed Hi-Hat",
  43: "High Floor Tom",
  44: "Pedal Hi-Hat",
  45: "Low Tom",
  46: "Open Hi-Hat",
  47: "Low-Mid Tom",
  48: "Hi-Mid Tom",
  49: "Crash Cymbal 1",
  50: "High Tom",
  51: "Ride Cymbal 1",
  52: "Chinese Cymbal",
  53: "Ride Bell",
  54: "Tambourine",
  55: "Splash Cymbal",
  56: "Cowbell",
  57: "Crash Cymbal 2",
  58: "Vibraslap",
  59: "Ride Cymbal 2",
  60: "Hi Bongo",
  61: "Low Bongo",
  62: "Mute Hi Conga",
  63: "Open Hi Conga",
  64: "Low Conga",
  65: "High Timbale",
  66: "Low Timbale",
  67: "High Agogo",
  68: "Low Agogo",
  69: "Cabasa",
  70: "Maracas",
  71: "Short Whistle",
  72: "Long Whistle",
  73: "Short Guiro",
  74: "Long Guiro",
  75: "Claves",
  76: "Hi Wood Block",
  77: "Low Wood Block",
  78: "Mute Cuica",
  79: "Open Cuica",
  80: "Mute Triangle",
  81: "Open Triangle",
};

/**
 * GM1 keys that have no piece of their own in the Tactus kit but are played like one of them (a second bass
 * drum, an electric snare, extra toms and cymbals). Tactus convention; the import report lists each use.
 */
export const GM1_SUBSTITUTES: Readonly<Record<number, KitPieceId>> = {
  35: "kick",
  40: "snare",
  41: "tom-floor",
  45: "tom-mid",
  48: "tom-high",
  52: "crash",
  55: "crash",
  57: "crash",
  59: "ride",
};

const BY_GM = new Map<number, KitPieceId>(KIT_PIECE_IDS.map((id) => [KIT_PIECES[id].gmNote, id]));

/** How a percussion key is read: the kit piece with that GM note, a substitute, or nothing. */
export type PercussionReading = { piece: KitPieceId; via: "gm" | "substitute" } | null;

/**
 * The kit piece for a GM percussion key.
 * @example percussionPiece(38) // { piece: "snare", via: "gm" }
 * @example percussionPiece(40) // { piece: "snare", via: "substitute" }
 * @example percussionPiece(75) // null (claves)
 */
export function percussionPiece(note: number): PercussionReading {
  const own = BY_GM.get(note);
  if (own) return { piece: own, via: "gm" };
  const sub = GM1_SUBSTITUTES[note];
  return sub ? { piece: sub, via: "substitute" } : null;
}

/** "Claves (75)", or "key 90" outside the GM1 map. */
export function percussionLabel(note: number): string {
  const name = GM1_PERCUSSION[note];
  return name ? `${name} (${note})` : `key ${note}`;
}
