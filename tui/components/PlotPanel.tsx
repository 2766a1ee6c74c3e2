import { Box } from "ink";
import type { Body } from "../screen.ts";
import { LineBlock } from "./LineBlock.tsx";
import { SegmentLine } from "./SegmentLine.tsx";

/** Props of {@link PlotPanel}. */
export interface PlotPanelProps {
  /**
   * A heading, the plot with its axes, and a legend: the pair view (joint
   * density as shaded regions or braille dots) or the trace view (walker-mean
   * log-posterior against step as a braille line plot).
   */
  readonly body: Extract<Body, { kind: "pair" | "trace" }>;
  /** Whether tones may use colour and styles. */
  readonly color: boolean;
}

/** A prepared text plot: heading, plot lines, legend. */
export function PlotPanel({ body, color }: PlotPanelProps) {
  return (
    <Box flexDirection="column">
      <SegmentLine line={body.heading} color={color} />
      <LineBlock lines={body.plot} color={color} />
      <LineBlock lines={body.legend} color={color} />
    </Box>
  );
}
