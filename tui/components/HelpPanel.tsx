import type { Body } from "../screen.ts";
import { LineBlock } from "./LineBlock.tsx";

/** Props of {@link HelpPanel}. */
export interface HelpPanelProps {
  /** Help lines: key map and the meaning of the marks. */
  readonly body: Extract<Body, { kind: "help" }>;
  /** Whether tones may use colour and styles. */
  readonly color: boolean;
}

/** The key map and the meaning of the convergence marks. */
export function HelpPanel({ body, color }: HelpPanelProps) {
  return <LineBlock lines={body.lines} color={color} />;
}
