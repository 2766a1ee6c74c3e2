import type { Line } from "../screen.ts";
import { SegmentLine } from "./SegmentLine.tsx";

/** Props of {@link TabBar}. */
export interface TabBarProps {
  /** The numbered view names, the current one in brackets. */
  readonly line: Line;
  /** Whether tones may use colour and styles. */
  readonly color: boolean;
}

/** The row of views, numbered by the keys that select them. */
export function TabBar({ line, color }: TabBarProps) {
  return <SegmentLine line={line} color={color} />;
}
