import type { Line } from "../screen.ts";
import { LineBlock } from "./LineBlock.tsx";

/** Props of {@link HeaderBar}. */
export interface HeaderBarProps {
  /** Title and state, progress bar with step/total, steps/s and ETA, run details, and alerts. */
  readonly lines: readonly Line[];
  /** Whether tones may use colour and styles. */
  readonly color: boolean;
}

/** The run header: state, progress, speed, ETA, walkers, threads and alerts. */
export function HeaderBar({ lines, color }: HeaderBarProps) {
  return <LineBlock lines={lines} color={color} />;
}
