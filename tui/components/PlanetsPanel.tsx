import { Box } from "ink";
import type { Body } from "../screen.ts";
import { LineBlock } from "./LineBlock.tsx";
import { SegmentLine } from "./SegmentLine.tsx";

/** Props of {@link PlanetsPanel}. */
export interface PlanetsPanelProps {
  /** Heading, a block of rows per planet in view, and notes. */
  readonly body: Extract<Body, { kind: "planets" }>;
  /** Whether tones may use colour and styles. */
  readonly color: boolean;
}

/** Derived quantities per planet: m sin i (a lower limit) in Jupiter and Earth masses, a, e, and lambda / psi where modelled. */
export function PlanetsPanel({ body, color }: PlanetsPanelProps) {
  return (
    <Box flexDirection="column">
      <SegmentLine line={body.heading} color={color} />
      <LineBlock lines={body.rows} color={color} />
      <LineBlock lines={body.note} color={color} />
    </Box>
  );
}
