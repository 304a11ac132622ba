/**
 * Puts a playback plan on a Tone transport. Every sound is started from the `time` argument Tone passes to the
 * transport callback (never from a JS timer); the playhead goes through Tone's Draw at the same time.
 *
 * Positions are kept in transport ticks of the WRITTEN music (PPQ ticks per quarter note), and the transport's
 * tempo is the groove's tempo in quarter notes per minute: a tempo change only changes the transport's bpm, and
 * every event keeps its place in the music. Swung positions fall between ticks; Tone's events keep the fraction.
 */
import type * as ToneNS from "tone";
import { type PlaybackPlan } from "../../lib/rhythm/playback-plan";
import { PPQ } from "./config";
import type { Tone } from "./tone-loader";
import type { VoiceBank } from "./voices";

export interface PlayPosition {
  /** Written bar (0-based; negative during the count-in). */
  bar: number;
  /** Counted beat (0-based). */
  beat: number;
  /** Seconds from the start of the play at the written tempo. */
  time: number;
  countIn: boolean;
}

export interface ScheduleHooks {
  onPosition?: (p: PlayPosition) => void;
  onEnded?: () => void;
  /** Run a visual update at an audio time (Tone's Draw); absent offline. */
  draw?: (fn: () => void, time: number) => void;
}

export interface ScheduleOptions {
  /** Multiple of the written tempo (default 1). */
  tempoFactor?: number;
  /** The loop body has already been played once (a reschedule while looping): tied continuations stay silent. */
  pastFirstPass?: boolean;
  /** Times through the loop body before the play ends (offline renders); default: loop until stopped. */
  passes?: number;
}

export interface ScheduledPlan {
  plan: PlaybackPlan;
  /** Transport ticks of a plan time (seconds at the written tempo). */
  ticksOf(seconds: number): number;
  /** Plan time (seconds at the written tempo) of a transport tick position. */
  secondsOf(ticks: number): number;
  /** Whether the loop has come round at least once. */
  readonly pastFirstPass: boolean;
  /** Remove every event of this plan from the transport. */
  clear(): void;
}

/** Seconds after the end of a play at which the transport is stopped (longer than one clock block). */
export const STOP_MARGIN = 0.2;

/** Quarter notes per minute of a plan's written tempo. */
export const quarterBpm = (plan: PlaybackPlan) => 240 / plan.secondsPerWhole;

/** Snap values within a millionth of a tick to the tick: loop points and bar lines must be whole ticks. */
function snap(ticks: number): number {
  const r = Math.round(ticks);
  return Math.abs(ticks - r) < 1e-6 ? r : ticks;
}

/**
 * Schedule `plan` on `transport` (stopped or running) at `tempoFactor` × its written tempo.
 * @example const s = schedulePlan(Tone, Tone.getTransport(), plan, bank, { onEnded }); Tone.getTransport().start();
 */
export function schedulePlan(
  T: Tone,
  transport: ToneNS.TransportInstance,
  plan: PlaybackPlan,
  bank: VoiceBank,
  hooks: ScheduleHooks = {},
  options: ScheduleOptions = {},
): ScheduledPlan {
  const { tempoFactor = 1, pastFirstPass = false, passes } = options;
  if (transport.PPQ !== PPQ) transport.PPQ = PPQ;
  const bpm = quarterBpm(plan) * tempoFactor;
  if (transport.state === "started") transport.bpm.value = bpm; // from now on (a tempo change while playing)
  else {
    // Before the start: the tempo must hold from the very first tick. Setting `.value` would apply it only from
    // now + look-ahead, so the first few milliseconds would run at the previous tempo and shift every onset.
    transport.bpm.cancelScheduledValues(0);
    transport.bpm.setValueAtTime(bpm, 0);
  }
  const perSecond = (4 * PPQ) / plan.secondsPerWhole; // ticks per second of the written tempo
  const ticksOf = (s: number) => snap(s * perSecond);
  // A transport time for Tone: whole ticks exactly as "Ni"; fractions as seconds at the bpm just set, which Tone
  // converts back to the same fractional tick.
  const at = (ticks: number): ToneNS.Unit.TransportTime => (Number.isInteger(ticks) ? `${ticks}i` : (ticks * 60) / (bpm * PPQ));
  const stretch = () => quarterBpm(plan) / transport.bpm.value;

  const ids: number[] = [];
  let loops = pastFirstPass ? 1 : 0;
  // Looping stops before the last time through the body (it then runs on to the end event at the body's end).
  const lastPass = () => passes !== undefined && loops >= passes - 1;
  const onLoop = () => {
    loops++;
    if (lastPass()) transport.loop = false;
  };
  if (plan.loop) {
    // Tone turns a loop point into ticks through seconds at the current tempo, which can land a hair above the
    // whole tick (768.0000000000002): the tick at the loop's end would then play before the wrap, and the loop's
    // first events would come one tick late. A loop end a thousandth of a tick early wraps exactly on its tick.
    const loopEnd = Math.round(ticksOf(plan.loop.end)) - 0.001;
    transport.setLoopPoints(`${Math.round(ticksOf(plan.loop.start))}i`, (loopEnd * 60) / (bpm * PPQ));
    transport.loop = !lastPass();
    transport.on("loop", onLoop);
  } else transport.loop = false;

  for (const e of plan.events) {
    ids.push(
      transport.schedule((time) => {
        if (e.firstPassOnly && loops > 0) return;
        bank.play(e, time, stretch());
      }, at(ticksOf(e.time))),
    );
  }
  const { onPosition, draw } = hooks;
  if (onPosition && draw)
    for (const m of plan.beats)
      ids.push(transport.schedule((time) => draw(() => onPosition({ bar: m.bar, beat: m.beat, time: m.time, countIn: m.countIn }), time), at(ticksOf(m.time))));
  // The end: never reached while the transport loops (it wraps at the loop's end before this tick's events).
  ids.push(
    transport.schedule((time) => {
      // Stopping at `time` from inside the transport's own callback lets its clock run on from tick 0 within the
      // block it is processing (the first events would sound again): stop once that block is over.
      transport.stop(time + STOP_MARGIN);
      const ended = hooks.onEnded;
      if (ended) (draw ?? ((fn: () => void) => fn()))(ended, time);
    }, at(ticksOf(plan.loop ? plan.loop.end : plan.end))),
  );

  return {
    plan,
    get pastFirstPass() {
      return loops > 0;
    },
    ticksOf,
    secondsOf: (ticks) => ticks / perSecond,
    clear() {
      for (const id of ids) transport.clear(id);
      ids.length = 0;
      transport.off("loop", onLoop);
    },
  };
}
