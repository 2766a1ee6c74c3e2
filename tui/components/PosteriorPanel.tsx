import { Box } from "ink";
import type { Body } from "../screen.ts";
import { LineBlock } from "./LineBlock.tsx";
import { SegmentLine } from "./SegmentLine.tsx";

/** Props of {@link PosteriorPanel}. */
export interface PosteriorPanelProps {
  /** Heading, one row per parameter in view, and details of the selected one. */
  readonly body: Extract<Body, { kind: "posterior" }>;
  /** Whether tones may use colour and styles. */
  readonly color: boolean;
}

/** Posterior per parameter: median, 68% interval, unit and a one-line histogram. */
export function PosteriorPanel({ body, color }: PosteriorPanelProps) {
  return (
    <Box flexDirection="column">
      <SegmentLine line={body.heading} color={color} />
      <LineBlock lines={body.rows} color={color} />
      <LineBlock lines={body.detail} color={color} />
    </Box>
  );
}
