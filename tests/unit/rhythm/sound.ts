/**
 * Test helper: compare two schedules directly (independently of compareGrooves), event by event,
 * within 1 microsecond (the tolerance the rhythm core promises).
 */
import { expect } from "vitest";
import type { ScheduledEvent } from "../../../src/lib/rhythm";

export const MICROSECOND = 1e-6;

interface Canon {
  t: number;
  id: string;
  d: number;
}

/** Events sorted by time, simultaneous ones (within 0.1 µs) by sound identity and duration. */
export function canonical(events: ScheduledEvent[], shift = 0): Canon[] {
  const list = events
    .map((e) => ({
      t: e.time - shift,
      id: e.kind === "kit" ? `kit ${e.piece} ${e.articulation ?? ""} ${e.velocity}` : `keys ${e.pitch} ${e.velocity}`,
      d: e.kind === "keys" ? e.duration : 0,
    }))
    .sort((a, b) => a.t - b.t);
  const out: Canon[] = [];
  for (let i = 0; i < list.length; ) {
    let j = i + 1;
    while (j < list.length && list[j]!.t - list[i]!.t <= 1e-7) j++;
    out.push(...list.slice(i, j).sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : a.d - b.d)));
    i = j;
  }
  return out;
}

/** Asserts b's events are a's events moved later by `shift` seconds (0: the same times). */
export function expectSameSound(a: ScheduledEvent[], b: ScheduledEvent[], shift = 0): void {
  const ca = canonical(a);
  const cb = canonical(b, shift);
  expect(cb.length).toBe(ca.length);
  ca.forEach((x, i) => {
    const y = cb[i]!;
    const where = `event ${i}: ${x.id} at ${x.t} s vs ${y.id} at ${y.t} s`;
    expect(y.id, where).toBe(x.id);
    expect(Math.abs(y.t - x.t), where).toBeLessThanOrEqual(MICROSECOND);
    expect(Math.abs(y.d - x.d), where).toBeLessThanOrEqual(MICROSECOND);
  });
}
