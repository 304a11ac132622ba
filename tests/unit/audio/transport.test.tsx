// @vitest-environment jsdom
/**
 * The volume control and its listening-safety note. Figures from WHO–ITU "Safe listening devices and systems"
 * (ITU-T H.870, 2018; 2022 edition), as collected in the project's references: adults 80 dB(A) for 40 hours a
 * week, children 75 dB(A); each +3 dB halves the safe time (83 dB → 20 h, 86 → 10 h, 89 → 5 h).
 */
import { cleanup, fireEvent, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import { DEFAULT_VOLUME_DB, VOLUME_RANGE_DB } from "../../../src/adapters/tone/config";
import { SAFE_LISTENING, safeListeningText, safeWeeklyHours } from "../../../src/components/transport/safe-listening";
import { VolumeControl } from "../../../src/components/transport/VolumeControl";

afterEach(cleanup);

describe("safe-listening figures (WHO–ITU H.870)", () => {
  it("gives 40 hours a week at 80 dB(A) for adults and at 75 dB(A) for children", () => {
    expect(SAFE_LISTENING.adultDbA).toBe(80);
    expect(SAFE_LISTENING.childDbA).toBe(75);
    expect(safeWeeklyHours(80)).toBe(40);
    expect(safeWeeklyHours(75, "child")).toBe(40);
  });

  it("halves the time for every 3 dB more: 83 dB → 20 h, 86 → 10 h, 89 → 5 h", () => {
    expect(safeWeeklyHours(83)).toBeCloseTo(20, 9);
    expect(safeWeeklyHours(86)).toBeCloseTo(10, 9);
    expect(safeWeeklyHours(89)).toBeCloseTo(5, 9);
    expect(safeWeeklyHours(78, "child")).toBeCloseTo(20, 9);
  });

  it("states those figures and their source in the note", () => {
    const text = safeListeningText();
    expect(text).toContain("80 dB for 40 hours a week");
    expect(text).toContain("75 dB for children");
    expect(text).toContain("every +3 dB halves it");
    expect(text).toContain("83 dB: 20 h");
    expect(text).toContain("86 dB: 10 h");
    expect(text).toContain("WHO–ITU H.870");
  });
});

describe("VolumeControl", () => {
  it("is a slider over the adapter's range, described by the safety note beside it", () => {
    render(<VolumeControl value={DEFAULT_VOLUME_DB} onChange={() => undefined} />);
    const slider = screen.getByRole("slider", { name: /Volume/ });
    expect(slider.getAttribute("min")).toBe(String(VOLUME_RANGE_DB.min));
    expect(slider.getAttribute("max")).toBe(String(VOLUME_RANGE_DB.max));
    expect((slider as HTMLInputElement).value).toBe("-12");
    expect(slider.getAttribute("aria-valuetext")).toBe("-12 dB");
    const note = document.getElementById(slider.getAttribute("aria-describedby")!);
    expect(note?.textContent).toContain("WHO–ITU H.870");
    expect(note?.textContent).toContain("80 dB for 40 hours");
  });

  it("reports the new level in dB", () => {
    const seen: number[] = [];
    render(<VolumeControl value={-12} onChange={(db) => seen.push(db)} note=" Audio is off." />);
    fireEvent.change(screen.getByRole("slider"), { target: { value: "-20" } });
    expect(seen).toEqual([-20]);
    expect(screen.getByText(/Audio is off\./)).toBeTruthy();
  });
});
