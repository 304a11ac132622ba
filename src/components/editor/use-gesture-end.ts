import { useEffect, type RefObject } from "react";

/**
 * Ends a pointer gesture (a paint run, a note drag) wherever the pointer is released, even outside the grid,
 * so the gesture always closes its one undo entry.
 * @example useGestureEnd(painting, actions.endGesture)
 */
export function useGestureEnd(active: RefObject<boolean>, end: () => void): void {
  useEffect(() => {
    const onRelease = () => {
      if (!active.current) return;
      active.current = false;
      end();
    };
    window.addEventListener("pointerup", onRelease);
    window.addEventListener("pointercancel", onRelease);
    return () => {
      window.removeEventListener("pointerup", onRelease);
      window.removeEventListener("pointercancel", onRelease);
    };
  }, [active, end]);
}
