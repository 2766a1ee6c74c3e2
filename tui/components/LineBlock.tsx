import { Box } from "ink";
import type { Line } from "../screen.ts";
import { SegmentLine } from "./SegmentLine.tsx";

/** Props of {@link LineBlock}. */
export interface LineBlockProps {
  /** Lines already fitted to the terminal width. */
  readonly lines: readonly Line[];
  /** Whether tones may use colour and styles. */
  readonly color: boolean;
}

/** A column of screen lines. */
export function LineBlock({ lines, color }: LineBlockProps) {
  return (
    <Box flexDirection="column">
      {lines.map((line, i) => <SegmentLine key={i} line={line} color={color} />)}
    </Box>
  );
}
