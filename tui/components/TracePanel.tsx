import { Box } from "ink";
import type { Body } from "../screen.ts";
import { LineBlock } from "./LineBlock.tsx";
import { SegmentLine } from "./SegmentLine.tsx";

/** Props of {@link TracePanel}. */
export interface TracePanelProps {
  /** Heading with the latest values, the braille line plot with its axes, and the legend. */
  readonly body: Extract<Body, { kind: "trace" }>;
  /** Whether tones may use colour and styles. */
  readonly color: boolean;
}

/** Walker-mean log-posterior against step, as a braille line plot. */
export function TracePanel({ body, color }: TracePanelProps) {
  return (
    <Box flexDirection="column">
      <SegmentLine line={body.heading} color={color} />
      <LineBlock lines={body.plot} color={color} />
      <LineBlock lines={body.legend} color={color} />
    </Box>
  );
}
