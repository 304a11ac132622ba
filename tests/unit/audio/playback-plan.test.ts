/**
 * The playback plan (count-in, metronome, loop range, start bar, open hi-hat, flam, ties across the seam),
 * checked against facts of the trade and the core's own schedule compiler:
 * - common practice: a count-in is whole bars of clicks at the groove's tempo with the downbeat marked;
 *   a metronome clicks the counted beat (quarters in 4/4, dotted quarters in 6/8, 2+2+3 in 7/8);
 *   quarter = 60 bpm lasts one second;
 * - common practice: the open hi-hat rings until the pedal closes it (a closed or foot stroke);
 *   a flam is a soft grace stroke just before the main stroke.
 */
import { describe, expect, it } from "vitest";
import { assertGroove, compileSchedule, emptyGroove, type GrooveDocumentInput } from "../../../src/lib/rhythm";
import {
  buildPlaybackPlan,
  carryPosition,
  CHOKE_SECONDS,
  CLICK_VELOCITY,
  FLAM_GRACE_SECONDS,
  OPEN_HAT_RING_SECONDS,
  positionAt,
  type PlanEvent,
} from "../../../src/lib/rhythm/playback-plan";

const groove = (patch: Partial<GrooveDocumentInput>) => assertGroove({ ...emptyGroove(), tempo: { bpm: 60, beatNote: "1/4" }, ...patch });
const close = (x: number, y: number, eps = 1e-9) => expect(Math.abs(x - y)).toBeLessThan(eps);
const clicks = (events: PlanEvent[]) => events.filter((e) => e.voice === "click");

const backbeat = groove({
  bars: 2,
  kit: {
    lanes: [
      { piece: "kick", hits: [{ at: "0" }, { at: "1" }] },
      { piece: "snare", hits: [{ at: "1/4" }, { at: "3/4" }, { at: "5/4" }, { at: "7/4" }] },
    ],
  },
});

describe("count-in", () => {
  it.each([1, 2])("%i bar(s) of 4/4 at quarter = 60: 4 clicks a bar, one a second, downbeats accented", (bars) => {
    const plan = buildPlaybackPlan(backbeat, { countInBars: bars });
    const count = plan.events.filter((e) => e.countIn);
    expect(count).toHaveLength(4 * bars);
    expect(count.every((e) => e.voice === "click")).toBe(true);
    expect(count.map((e) => e.time)).toEqual(Array.from({ length: 4 * bars }, (_, i) => i));
    expect(count.map((e) => e.downbeat)).toEqual(Array.from({ length: 4 * bars }, (_, i) => i % 4 === 0));
    expect(count.filter((e) => e.downbeat).every((e) => e.velocity === CLICK_VELOCITY.downbeat)).toBe(true);
    expect(count.filter((e) => !e.downbeat).every((e) => e.velocity < CLICK_VELOCITY.downbeat)).toBe(true);
    expect(plan.countInSeconds).toBe(4 * bars);
    // The groove starts right after the count-in: the first kick is on the first beat after it.
    const firstKick = plan.events.find((e) => e.voice === "kick")!;
    expect(firstKick.time).toBe(4 * bars);
    expect(count[0]!.bar).toBe(-bars);
  });

  it("lasts two dotted-quarter beats per bar in 6/8 (2 s a bar at dotted quarter = 60)", () => {
    const d = groove({ meter: { beatsPerBar: 6, beatUnit: 8 }, tempo: { bpm: 60, beatNote: "3/8" }, grid: { step: "1/8" } });
    const plan = buildPlaybackPlan(d, { countInBars: 1 });
    expect(plan.countInSeconds).toBe(2);
    expect(clicks(plan.events).map((e) => e.time)).toEqual([0, 1]);
  });

  it("is absent when countInBars is 0", () => {
    const plan = buildPlaybackPlan(backbeat, { countInBars: 0 });
    expect(plan.events.some((e) => e.countIn)).toBe(false);
    expect(plan.events[0]!.time).toBe(0);
  });
});

describe("metronome", () => {
  it("clicks every quarter of 4/4, the first of each bar accented", () => {
    const plan = buildPlaybackPlan(backbeat, { metronome: true });
    const c = clicks(plan.events);
    expect(c.map((e) => e.time)).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
    expect(c.map((e) => e.downbeat)).toEqual([true, false, false, false, true, false, false, false]);
    expect(c.map((e) => [e.bar, e.beat])).toEqual([[0, 0], [0, 1], [0, 2], [0, 3], [1, 0], [1, 1], [1, 2], [1, 3]]);
  });

  it("clicks the dotted quarter in 6/8: two clicks a bar, not six (common practice)", () => {
    const d = groove({ bars: 2, meter: { beatsPerBar: 6, beatUnit: 8 }, tempo: { bpm: 60, beatNote: "3/8" }, grid: { step: "1/8" } });
    const c = clicks(buildPlaybackPlan(d, { metronome: true }).events);
    expect(c).toHaveLength(4);
    expect(c.map((e) => e.time)).toEqual([0, 1, 2, 3]);
    expect(c.map((e) => e.downbeat)).toEqual([true, false, true, false]);
  });

  it("follows the grouping of 7/8 as 2+2+3 (eighth = 60: clicks at 0, 1, 2 s; the bar lasts 3.5 s)", () => {
    const d = groove({ meter: { beatsPerBar: 7, beatUnit: 8, grouping: [2, 2, 3] }, tempo: { bpm: 120, beatNote: "1/8" }, grid: { step: "1/8" } });
    const plan = buildPlaybackPlan(d, { metronome: true, loopRange: { startBar: 0, endBar: 1 } });
    expect(clicks(plan.events).map((e) => e.time)).toEqual([0, 1, 2]);
    expect(plan.loop).toEqual({ start: 0, end: 3.5 });
  });

  it("is silent when off", () => {
    expect(clicks(buildPlaybackPlan(backbeat, {}).events)).toHaveLength(0);
  });

  it("stays on the beat when the groove swings (beats are the boundaries of swing pairs)", () => {
    const d = groove({ swing: { unit: "1/8", ratio: 2 / 3 }, kit: { lanes: [{ piece: "hihat-closed", hits: [{ at: "0" }, { at: "1/8" }] }] } });
    const plan = buildPlaybackPlan(d, { metronome: true });
    expect(clicks(plan.events).map((e) => e.time)).toEqual([0, 1, 2, 3]);
    close(plan.events.filter((e) => e.voice === "hihat-closed")[1]!.time, 2 / 3);
  });
});

describe("loop range and start bar", () => {
  const four = groove({
    bars: 4,
    kit: { lanes: [{ piece: "kick", hits: [0, 1, 2, 3].map((b) => ({ at: `${b}` })) }] },
  });

  it("loops the selected bars only, once each, from their first bar", () => {
    const plan = buildPlaybackPlan(four, { loopRange: { startBar: 1, endBar: 3 } });
    expect(plan.body).toEqual([1, 2]);
    expect(plan.loop).toEqual({ start: 0, end: 8 });
    expect(plan.events.map((e) => [e.time, e.bar])).toEqual([[0, 1], [4, 2]]);
  });

  it("loops the whole song form (sections with their repeats) when every bar is selected", () => {
    const d = assertGroove({ ...four, sections: [{ name: "A", startBar: 0, bars: 2, repeats: 2 }, { name: "B", startBar: 2, bars: 2, repeats: 1 }] });
    const plan = buildPlaybackPlan(d, { loopRange: { startBar: 0, endBar: 4 } });
    expect(plan.body).toEqual([0, 1, 0, 1, 2, 3]);
    expect(plan.loop).toEqual({ start: 0, end: 24 });
    // Same onsets as the core's schedule of the play order.
    expect(plan.events.map((e) => e.time)).toEqual(compileSchedule(d).map((e) => e.time));
  });

  it("puts the loop after the count-in", () => {
    const plan = buildPlaybackPlan(four, { loopRange: { startBar: 0, endBar: 4 }, countInBars: 1 });
    expect(plan.loop).toEqual({ start: 4, end: 20 });
  });

  it("starting in the middle plays the rest of the range once, then loops the whole range", () => {
    const plan = buildPlaybackPlan(four, { loopRange: { startBar: 0, endBar: 4 }, startBar: 2, countInBars: 1 });
    const kicks = plan.events.filter((e) => e.voice === "kick");
    // count-in 0–4 s, bars 2 and 3 (4–12 s), then the loop of bars 0–3 (12–28 s).
    expect(kicks.map((e) => [e.time, e.bar])).toEqual([[4, 2], [8, 3], [12, 0], [16, 1], [20, 2], [24, 3]]);
    expect(plan.loop).toEqual({ start: 12, end: 28 });
  });

  it("without a loop, starting at a bar plays to the end and stops there", () => {
    const plan = buildPlaybackPlan(four, { startBar: 3 });
    expect(plan.loop).toBeNull();
    expect(plan.events.map((e) => e.bar)).toEqual([3]);
    expect(plan.end).toBe(4);
  });

  it("without options, plays the core's schedule once, event for event", () => {
    const plan = buildPlaybackPlan(backbeat);
    const schedule = compileSchedule(backbeat);
    expect(plan.events.map((e) => [e.time, e.voice, e.velocity])).toEqual(schedule.map((e) => [e.time, e.piece, e.velocity]));
    expect(plan.end).toBe(8);
  });
});

describe("playhead", () => {
  it("names the bar and counted beat heard at a time, count-in first", () => {
    const plan = buildPlaybackPlan(backbeat, { countInBars: 1 });
    expect(positionAt(plan, 0.5)).toMatchObject({ bar: -1, beat: 0, countIn: true });
    expect(positionAt(plan, 4)).toMatchObject({ bar: 0, beat: 0, countIn: false });
    expect(positionAt(plan, 6.99)).toMatchObject({ bar: 0, beat: 2 });
    expect(positionAt(plan, 9.2)).toMatchObject({ bar: 1, beat: 1 });
    expect(plan.beats).toHaveLength(12);
  });

  it("gives kit events the counted beat they fall in", () => {
    const plan = buildPlaybackPlan(backbeat);
    expect(plan.events.filter((e) => e.voice === "snare").map((e) => [e.bar, e.beat])).toEqual([[0, 1], [0, 3], [1, 1], [1, 3]]);
  });
});

describe("articulations", () => {
  it("an open hi-hat rings until the next closed or foot stroke (common practice)", () => {
    const d = groove({
      kit: {
        lanes: [
          { piece: "hihat-closed", hits: [{ at: "0", articulation: "open" }, { at: "1/2" }] },
          { piece: "hihat-open", hits: [{ at: "1/4" }] },
          { piece: "hihat-foot", hits: [{ at: "3/8" }] },
        ],
      },
    });
    const opens = buildPlaybackPlan(d).events.filter((e) => e.voice === "hihat-open");
    expect(opens).toHaveLength(2);
    close(opens[0]!.duration, Math.min(OPEN_HAT_RING_SECONDS, 1.5)); // closed by the foot at 1.5 s
    close(opens[1]!.duration, 0.5); // the foot at 1.5 s closes the open hat struck at 1 s
  });

  it("in a loop, an open hi-hat at the end is closed by the first closed stroke of the next time round", () => {
    const d = groove({ kit: { lanes: [{ piece: "hihat-closed", hits: [{ at: "0" }, { at: "15/16", articulation: "open" }] }] } });
    const open = buildPlaybackPlan(d, { loopRange: { startBar: 0, endBar: 1 } }).events.find((e) => e.voice === "hihat-open")!;
    close(open.duration, 0.25);
  });

  it("a choked cymbal stops short", () => {
    const d = groove({ kit: { lanes: [{ piece: "crash", hits: [{ at: "0", articulation: "choke" }] }] } });
    expect(buildPlaybackPlan(d).events[0]!.duration).toBe(CHOKE_SECONDS);
  });

  it("a flam adds a softer grace stroke just before the main stroke (common practice)", () => {
    const d = groove({ kit: { lanes: [{ piece: "snare", hits: [{ at: "1/4", articulation: "flam" }] }] } });
    const snares = buildPlaybackPlan(d).events.filter((e) => e.voice === "snare");
    expect(snares).toHaveLength(2);
    close(snares[0]!.time, 1 - FLAM_GRACE_SECONDS);
    expect(snares[0]!.grace).toBe(true);
    expect(snares[0]!.velocity).toBeLessThan(snares[1]!.velocity);
    expect(snares[1]!.time).toBe(1);
  });

  it("a flam on the loop's first step gets its grace at the end of every time through the loop", () => {
    const d = groove({ kit: { lanes: [{ piece: "snare", hits: [{ at: "0", articulation: "flam" }] }] } });
    const plan = buildPlaybackPlan(d, { loopRange: { startBar: 0, endBar: 1 }, countInBars: 1 });
    const graces = plan.events.filter((e) => e.grace).map((e) => e.time);
    expect(graces).toHaveLength(2);
    close(graces[0]!, 4 - FLAM_GRACE_SECONDS); // first time: in the count-in
    close(graces[1]!, 8 - FLAM_GRACE_SECONDS); // every time round: at the end of the body
    expect(graces.every((t) => t >= plan.countInSeconds - 1 && t < plan.loop!.end)).toBe(true);
  });
});

describe("one stroke per voice at a time", () => {
  it("an open articulation on the closed row and an open hi-hat at the same place sound once", () => {
    const d = groove({
      kit: {
        lanes: [
          { piece: "hihat-closed", hits: [{ at: "0", articulation: "open" }] },
          { piece: "hihat-open", hits: [{ at: "0", dynamic: "accent" }] },
        ],
      },
    });
    const opens = buildPlaybackPlan(d).events.filter((e) => e.voice === "hihat-open");
    expect(opens).toHaveLength(1);
    expect(opens[0]!.dynamic).toBe("accent");
  });

  it("a flam's grace that lands on another stroke of the same drum is not played twice", () => {
    // 32nd notes at quarter = 300 are 25 ms apart: the grace of the second falls on the first.
    const d = groove({ tempo: { bpm: 300, beatNote: "1/4" }, grid: { step: "1/32" }, kit: { lanes: [{ piece: "snare", hits: [{ at: "0" }, { at: "1/32", articulation: "flam" }] }] } });
    const times = buildPlaybackPlan(d).events.map((e) => e.time);
    expect(times).toHaveLength(2);
    expect(new Set(times.map((t) => t.toFixed(6))).size).toBe(2);
  });
});

describe("keys held across the loop seam", () => {
  const tied = groove({
    bars: 2,
    keys: {
      notes: [
        { at: "0", duration: "1/4", pitch: 60, tiedFromEnd: true },
        { at: "7/4", duration: "1/4", pitch: 60 },
      ],
      splitPitch: 60,
    },
  });

  it("sound as one note when the loop repeats: the held note is lengthened, its continuation only starts the first pass", () => {
    const plan = buildPlaybackPlan(tied, { loopRange: { startBar: 0, endBar: 2 } });
    const notes = plan.events.filter((e) => e.voice === "keys");
    expect(notes.map((n) => [n.time, n.duration, n.firstPassOnly ?? false])).toEqual([[0, 1, true], [7, 2, false]]);
  });

  it("without a loop, both pieces are plain notes", () => {
    const notes = buildPlaybackPlan(tied).events.filter((e) => e.voice === "keys");
    expect(notes.map((n) => [n.time, n.duration, n.firstPassOnly ?? false])).toEqual([[0, 1, false], [7, 1, false]]);
  });
});

describe("carrying the position over a change while playing", () => {
  const at = (bpm: number, bars = 4) => groove({ bars, tempo: { bpm, beatNote: "1/4" } });

  it("keeps the place in the music across a tempo change (beat 3 of bar 2 stays beat 3 of bar 2)", () => {
    const slow = buildPlaybackPlan(at(60), { loopRange: { startBar: 0, endBar: 4 } });
    const fast = buildPlaybackPlan(at(120), { loopRange: { startBar: 0, endBar: 4 } });
    // Quarter = 60: bar 2 (index 1) starts at 4 s; beat 3 and a half is 2.5 s into it.
    const t = carryPosition(slow, 6.5, fast, false)!;
    close(t, 3.25); // the same place at quarter = 120
    expect(positionAt(fast, t)).toMatchObject({ bar: 1, beat: 2 });
  });

  it("keeps the bar when the loop range shrinks around it, and jumps to the new loop when it leaves it", () => {
    const all = buildPlaybackPlan(at(60), { loopRange: { startBar: 0, endBar: 4 } });
    const middle = buildPlaybackPlan(at(60), { loopRange: { startBar: 2, endBar: 4 } });
    close(carryPosition(all, 9, middle, true)!, 1); // bar 3, beat 2 → 1 s into the new body [2, 3]
    expect(carryPosition(all, 1, middle, true)).toBe(0); // bar 1 is no longer played
  });

  it("follows a count-in added or removed while the groove plays", () => {
    const plain = buildPlaybackPlan(at(60), { loopRange: { startBar: 0, endBar: 4 } });
    const counted = buildPlaybackPlan(at(60), { loopRange: { startBar: 0, endBar: 4 }, countInBars: 1 });
    close(carryPosition(plain, 5, counted, false)!, 9); // bar 2, beat 2: 4 s later once the count-in comes first
    close(carryPosition(counted, 9, plain, false)!, 5);
  });

  it("ends a play without loop that is already past the new end", () => {
    const long = buildPlaybackPlan(at(60, 4));
    const short = buildPlaybackPlan(at(60, 2));
    expect(carryPosition(long, 13, short, false)).toBeNull();
    close(carryPosition(long, 5, short, false)!, 5);
  });
});
