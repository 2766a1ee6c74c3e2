import type { Line } from "../screen.ts";
import { SegmentLine } from "./SegmentLine.tsx";

/** Props of {@link FooterBar}. */
export interface FooterBarProps {
  /** The keys that matter in the current view. */
  readonly line: Line;
  /** Whether tones may use colour and styles. */
  readonly color: boolean;
}

/** One line of key hints at the bottom of the screen. */
export function FooterBar({ line, color }: FooterBarProps) {
  return <SegmentLine line={line} color={color} />;
}
