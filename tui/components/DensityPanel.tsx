import { Box } from "ink";
import type { Body } from "../screen.ts";
import { LineBlock } from "./LineBlock.tsx";
import { SegmentLine } from "./SegmentLine.tsx";

/** Props of {@link DensityPanel}. */
export interface DensityPanelProps {
  /** Heading naming the pair, the plot with its axes, and the legend. */
  readonly body: Extract<Body, { kind: "pair" }>;
  /** Whether tones may use colour and styles. */
  readonly color: boolean;
}

/** Joint density of two parameters as shaded highest-density regions or braille dots. */
export function DensityPanel({ body, color }: DensityPanelProps) {
  return (
    <Box flexDirection="column">
      <SegmentLine line={body.heading} color={color} />
      <LineBlock lines={body.plot} color={color} />
      <LineBlock lines={body.legend} color={color} />
    </Box>
  );
}
