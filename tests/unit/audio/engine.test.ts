/**
 * The audio adapter's settings and its scheduling arithmetic, without Tone.js: the engine and the master chain
 * are driven with small fakes that record what they are asked to do.
 * Sources: WHO–ITU H.870 (safe listening) for why the default level is moderate; common practice for the
 * velocity curve (amplitude = (v/127)², 40·log10(v/127) dB, as General MIDI synthesizers do; from memory of the
 * DLS Level 1 default); the core's compileSchedule as the oracle for onset times.
 */
import { describe, expect, it } from "vitest";
import {
  DEFAULT_VOLUME_DB,
  LIMITER_THRESHOLD_DB,
  LIVE_LOOK_AHEAD,
  OFFLINE_LOOK_AHEAD,
  PPQ,
  VOLUME_RANGE_DB,
  dbToGain,
  velocityGain,
} from "../../../src/adapters/tone/config";
import { schedulePlan } from "../../../src/adapters/tone/engine";
import { clampVolume, createMasterChain } from "../../../src/adapters/tone/master";
import type { VoiceBank } from "../../../src/adapters/tone/voices";
import { midiToHz } from "../../../src/adapters/tone/voices";
import { assertGroove, compileSchedule, emptyGroove, type GrooveDocumentInput } from "../../../src/lib/rhythm";
import { buildPlaybackPlan, type PlanEvent } from "../../../src/lib/rhythm/playback-plan";

describe("configuration values", () => {
  it("plays at a moderate level by default, under a limiter just below full scale", () => {
    expect(DEFAULT_VOLUME_DB).toBe(-12);
    expect(LIMITER_THRESHOLD_DB).toBe(-1);
    expect(dbToGain(LIMITER_THRESHOLD_DB)).toBeCloseTo(0.891, 3);
    expect(VOLUME_RANGE_DB.max).toBeLessThanOrEqual(0);
    expect(DEFAULT_VOLUME_DB).toBeGreaterThanOrEqual(VOLUME_RANGE_DB.min);
  });

  it("keeps live latency small (look-ahead 30 ms, a third of Tone's 0.1 s default) and offline onsets on their sample", () => {
    expect(LIVE_LOOK_AHEAD).toBeGreaterThanOrEqual(0.02);
    expect(LIVE_LOOK_AHEAD).toBeLessThanOrEqual(0.05);
    expect(OFFLINE_LOOK_AHEAD).toBeGreaterThan(0);
  });

  it("uses a PPQ that every grid the editor offers divides (quarters to 32nds, eighth and sixteenth triplets)", () => {
    // Ticks per whole note = 4 × PPQ; a grid step of 1/n whole note is a whole number of ticks when n divides it.
    for (const n of [4, 8, 12, 16, 24, 32]) expect((4 * PPQ) % n).toBe(0);
  });

  it("maps velocity to amplitude by the square law: 127 → 0 dB, 64 → −11.9 dB, ghost (40) → −20 dB", () => {
    expect(velocityGain(127)).toBe(1);
    expect(20 * Math.log10(velocityGain(64))).toBeCloseTo(40 * Math.log10(64 / 127), 9);
    expect(20 * Math.log10(velocityGain(64))).toBeCloseTo(-11.9, 1);
    expect(20 * Math.log10(velocityGain(40))).toBeCloseTo(-20.07, 2);
    expect(velocityGain(0)).toBe(0);
    expect(velocityGain(300)).toBe(1);
  });

  it("tunes keys to A4 = 440 Hz at MIDI 69, middle C (60) ≈ 261.63 Hz (General MIDI)", () => {
    expect(midiToHz(69)).toBe(440);
    expect(midiToHz(60)).toBeCloseTo(261.626, 3);
    expect(midiToHz(81)).toBeCloseTo(880, 9);
  });

  it("keeps the volume control inside its range", () => {
    expect(clampVolume(12)).toBe(VOLUME_RANGE_DB.max);
    expect(clampVolume(-90)).toBe(VOLUME_RANGE_DB.min);
    expect(clampVolume(Number.NaN)).toBe(DEFAULT_VOLUME_DB);
    expect(clampVolume(-Infinity)).toBe(-Infinity);
  });
});

/** Records the nodes the master chain builds and how they are connected. */
function fakeTone() {
  const made: { kind: string; value: number; to: unknown[] }[] = [];
  const destination = { kind: "destination" };
  class Node {
    to: unknown[] = [];
    constructor(
      readonly kind: string,
      readonly value: number,
    ) {
      made.push(this);
    }
    chain(...nodes: unknown[]) {
      this.to = nodes;
      return this;
    }
    connect(node: unknown) {
      this.to = [node];
      return this;
    }
    dispose() {}
  }
  const T = {
    Volume: class extends Node {
      volume = { rampTo: () => undefined };
      mute = false;
      constructor(db: number) {
        super("volume", db);
      }
    },
    Limiter: class extends Node {
      constructor(db: number) {
        super("limiter", db);
      }
    },
    getDestination: () => destination,
  };
  return { T, made, destination };
}

describe("master chain", () => {
  it("routes every voice through the volume (−12 dB by default), then the limiter at −1 dBFS, then the output", () => {
    const { T, made, destination } = fakeTone();
    const chain = createMasterChain(T as never);
    const [volume, limiter] = made;
    expect(volume).toMatchObject({ kind: "volume", value: DEFAULT_VOLUME_DB });
    expect(limiter).toMatchObject({ kind: "limiter", value: LIMITER_THRESHOLD_DB });
    expect(volume!.to).toEqual([limiter, destination]);
    expect(chain.input).toBe(volume);
  });

  it("can tap before the limiter for timing analysis", () => {
    const { T, made, destination } = fakeTone();
    createMasterChain(T as never, { limiter: false, volumeDb: -20 });
    expect(made.map((n) => n.kind)).toEqual(["volume"]);
    expect(made[0]!.value).toBe(-20);
    expect(made[0]!.to).toEqual([destination]);
  });
});

/** A transport that records what is scheduled, and can fire its events in tick order like Tone's. */
function fakeTransport(state: "started" | "stopped" = "stopped") {
  const events: { id: number; cb: (time: number) => void; ticks: number }[] = [];
  const handlers: Record<string, (() => void)[]> = {};
  const bpmLog: string[] = [];
  let bpmValue = 120;
  let id = 0;
  const transport = {
    PPQ: 192,
    state,
    loop: false,
    loopPoints: [] as (string | number)[],
    stops: [] as number[],
    bpm: {
      get value() {
        return bpmValue;
      },
      set value(v: number) {
        bpmLog.push(`value ${v}`);
        bpmValue = v;
      },
      cancelScheduledValues: (t: number) => bpmLog.push(`cancel ${t}`),
      setValueAtTime: (v: number, t: number) => {
        bpmLog.push(`set ${v} at ${t}`);
        bpmValue = v;
      },
    },
    /** What Tone does with a TransportTime: "Ni" is N ticks; a number is seconds at the current tempo. */
    schedule(cb: (time: number) => void, time: string | number) {
      const ticks = typeof time === "string" ? Number(/^(\d+)i$/.exec(time)![1]) : (time * bpmValue * transport.PPQ) / 60;
      events.push({ id: ++id, cb, ticks });
      return id;
    },
    clear(eventId: number) {
      const k = events.findIndex((e) => e.id === eventId);
      if (k >= 0) events.splice(k, 1);
    },
    setLoopPoints(a: string | number, b: string | number) {
      transport.loopPoints = [a, b];
    },
    on(name: string, fn: () => void) {
      (handlers[name] ??= []).push(fn);
    },
    off(name: string, fn: () => void) {
      handlers[name] = (handlers[name] ?? []).filter((f) => f !== fn);
    },
    emit(name: string) {
      for (const fn of handlers[name] ?? []) fn();
    },
    stop(time: number) {
      transport.stops.push(time);
    },
  };
  return { transport, events, bpmLog };
}

function recordingBank() {
  const played: { e: PlanEvent; time: number }[] = [];
  const bank: VoiceBank = { play: (e, time) => void played.push({ e, time }), prepare: () => undefined, silence: () => undefined, dispose: () => undefined };
  return { bank, played };
}

const groove = (patch: Partial<GrooveDocumentInput>) => assertGroove({ ...emptyGroove(), ...patch });

describe("schedulePlan", () => {
  const swung = groove({
    bars: 2,
    tempo: { bpm: 180, beatNote: "1/4" },
    swing: { unit: "1/8", ratio: 2 / 3 },
    kit: {
      lanes: [
        { piece: "hihat-closed", hits: Array.from({ length: 16 }, (_, i) => ({ at: `${i}/8` })) },
        { piece: "snare", hits: [{ at: "1/4" }, { at: "3/4" }, { at: "5/4" }, { at: "7/4" }] },
      ],
    },
    keys: { notes: [{ at: "1/8", duration: "1/8", pitch: 64 }], splitPitch: 60 },
  });

  it("puts every event at the core's onset time: transport ticks = seconds × bpm/60 × PPQ, swing fractions kept", () => {
    const { transport, events } = fakeTransport();
    const { bank } = recordingBank();
    const plan = buildPlaybackPlan(swung);
    schedulePlan({} as never, transport as never, plan, bank);
    const ticksPerSecond = (180 / 60) * PPQ; // quarter = 180
    const expected = compileSchedule(swung).map((e) => e.time * ticksPerSecond);
    const got = events.slice(0, plan.events.length).map((e) => e.ticks);
    expect(got).toHaveLength(expected.length);
    got.forEach((t, i) => expect(Math.abs(t - expected[i]!)).toBeLessThan(1e-6));
    // Straight positions are whole ticks given exactly ("Ni"); the swung off-beats sit at 2/3 of the beat.
    expect(got.filter((t) => Number.isInteger(t)).length).toBeGreaterThan(0);
    expect(got).toContain((2 / 3) * PPQ);
  });

  it("sets the written tempo from the first tick when stopped, and from now on when playing", () => {
    const stopped = fakeTransport("stopped");
    schedulePlan({} as never, stopped.transport as never, buildPlaybackPlan(swung), recordingBank().bank);
    expect(stopped.bpmLog).toEqual(["cancel 0", "set 180 at 0"]);
    const playing = fakeTransport("started");
    schedulePlan({} as never, playing.transport as never, buildPlaybackPlan(swung), recordingBank().bank, {}, { tempoFactor: 0.5 });
    expect(playing.bpmLog).toEqual(["value 90"]);
  });

  it("in 6/8 at dotted quarter = 120, runs the transport at quarter = 180 (a dotted quarter is 1.5 quarters)", () => {
    const d = groove({ meter: { beatsPerBar: 6, beatUnit: 8 }, tempo: { bpm: 120, beatNote: "3/8" }, grid: { step: "1/8" } });
    const { transport } = fakeTransport();
    schedulePlan({} as never, transport as never, buildPlaybackPlan(d), recordingBank().bank);
    expect(transport.bpm.value).toBeCloseTo(180, 9);
  });

  it("sets whole-tick loop points around the body and stops at the end of a play without loop", () => {
    const looped = fakeTransport();
    schedulePlan({} as never, looped.transport as never, buildPlaybackPlan(swung, { loopRange: { startBar: 0, endBar: 2 }, countInBars: 1 }), recordingBank().bank);
    // One bar of 4/4 = 4 quarters = 768 ticks of count-in, then two bars.
    expect(looped.transport.loopPoints[0]).toBe(`${4 * PPQ}i`);
    // The end is given in seconds at quarter = 180, a thousandth of a tick before the whole tick (see the engine).
    const endTicks = (Number(looped.transport.loopPoints[1]) * 180 * PPQ) / 60;
    expect(endTicks).toBeLessThan(12 * PPQ);
    expect(endTicks).toBeGreaterThan(12 * PPQ - 0.01);
    expect(looped.transport.loop).toBe(true);

    const once = fakeTransport();
    let ended = 0;
    schedulePlan({} as never, once.transport as never, buildPlaybackPlan(swung), recordingBank().bank, { onEnded: () => ended++ });
    expect(once.transport.loop).toBe(false);
    const last = once.events[once.events.length - 1]!;
    expect(last.ticks).toBe(8 * PPQ);
    last.cb(2.6667);
    expect(ended).toBe(1);
    expect(once.transport.stops[0]).toBeGreaterThan(2.6667); // after the block being processed
  });

  it("plays a note tied across the loop seam only the first time through", () => {
    const tied = groove({
      bars: 2,
      keys: { notes: [{ at: "0", duration: "1/4", pitch: 60, tiedFromEnd: true }, { at: "7/4", duration: "1/4", pitch: 60 }], splitPitch: 60 },
    });
    const { transport, events } = fakeTransport();
    const { bank, played } = recordingBank();
    schedulePlan({} as never, transport as never, buildPlaybackPlan(tied, { loopRange: { startBar: 0, endBar: 2 } }), bank);
    const atZero = events.find((e) => e.ticks === 0)!;
    atZero.cb(0);
    transport.emit("loop");
    atZero.cb(5);
    expect(played.map((p) => p.time)).toEqual([0]);
  });

  it("stops looping before the last pass when a number of passes is asked (offline renders)", () => {
    const { transport } = fakeTransport();
    schedulePlan({} as never, transport as never, buildPlaybackPlan(swung, { loopRange: { startBar: 0, endBar: 2 } }), recordingBank().bank, {}, { passes: 3 });
    expect(transport.loop).toBe(true);
    transport.emit("loop");
    expect(transport.loop).toBe(true);
    transport.emit("loop");
    expect(transport.loop).toBe(false);
  });

  it("removes its events and its loop listener when cleared", () => {
    const { transport, events } = fakeTransport();
    const s = schedulePlan({} as never, transport as never, buildPlaybackPlan(swung, { loopRange: { startBar: 0, endBar: 2 } }), recordingBank().bank);
    expect(events.length).toBeGreaterThan(0);
    s.clear();
    expect(events).toHaveLength(0);
  });
});
