import { Box } from "ink";
import type { Body } from "../screen.ts";
import { LineBlock } from "./LineBlock.tsx";
import { SegmentLine } from "./SegmentLine.tsx";

/** Props of {@link ConvergencePanel}. */
export interface ConvergencePanelProps {
  /** Heading, one row per parameter in view, and the legend of the marks. */
  readonly body: Extract<Body, { kind: "convergence" }>;
  /** Whether tones may use colour and styles. */
  readonly color: boolean;
}

/** Convergence per parameter: R-hat, bulk and tail ESS, tau, steps per tau, each flagged against the run's thresholds. */
export function ConvergencePanel({ body, color }: ConvergencePanelProps) {
  return (
    <Box flexDirection="column">
      <SegmentLine line={body.heading} color={color} />
      <LineBlock lines={body.rows} color={color} />
      <LineBlock lines={body.legend} color={color} />
    </Box>
  );
}
