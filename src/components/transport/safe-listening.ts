/**
 * Safe-listening figures for the note beside every volume control, from WHO–ITU "Safe listening devices and
 * systems" (ITU-T H.870, 2018; 2022 edition): a weekly sound allowance of 80 dB(A) for 40 hours for adults and
 * 75 dB(A) for 40 hours for children and sensitive listeners, with a 3 dB exchange rate (each +3 dB halves the time).
 */

export const SAFE_LISTENING = {
  adultDbA: 80,
  childDbA: 75,
  weeklyHours: 40,
  exchangeDb: 3,
  source: "WHO–ITU H.870",
} as const;

/**
 * Hours a week one can listen at a level and stay within the H.870 allowance.
 * @example safeWeeklyHours(86) // 10
 */
export function safeWeeklyHours(levelDbA: number, listener: "adult" | "child" = "adult"): number {
  const base = listener === "adult" ? SAFE_LISTENING.adultDbA : SAFE_LISTENING.childDbA;
  return SAFE_LISTENING.weeklyHours / 2 ** ((levelDbA - base) / SAFE_LISTENING.exchangeDb);
}

const fmtHours = (h: number) => `${Number.isInteger(h) ? h : h.toFixed(1)} h`;

/** The note's text, built from the figures above. */
export function safeListeningText(): string {
  const { adultDbA, childDbA, weeklyHours, exchangeDb, source } = SAFE_LISTENING;
  const louder = [1, 2].map((k) => `${adultDbA + k * exchangeDb} dB: ${fmtHours(safeWeeklyHours(adultDbA + k * exchangeDb))}`).join(", ");
  return (
    `Keep it moderate: ${adultDbA} dB for ${weeklyHours} hours a week is the adult safe-listening budget ` +
    `(${childDbA} dB for children); every +${exchangeDb} dB halves it (${louder}). Source: ${source}.`
  );
}
