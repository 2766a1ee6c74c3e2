import type { Body } from "../screen.ts";
import { LineBlock } from "./LineBlock.tsx";

/** Props of {@link WaitingPanel}. */
export interface WaitingPanelProps {
  /** What the dashboard is waiting for. */
  readonly body: Extract<Body, { kind: "waiting" }>;
  /** Whether tones may use colour and styles. */
  readonly color: boolean;
}

/** Shown until the first snapshot of the run directory arrives. */
export function WaitingPanel({ body, color }: WaitingPanelProps) {
  return <LineBlock lines={body.lines} color={color} />;
}
