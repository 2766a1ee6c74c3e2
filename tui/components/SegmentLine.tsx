import { Text } from "ink";
import type { Line } from "../screen.ts";
import { toneProps } from "./tone.ts";

/** What an empty line draws, so it still takes its row. */
const BLANK = " ";

/** Props of {@link SegmentLine}. */
export interface SegmentLineProps {
  /** Segments already fitted to the terminal width. */
  readonly line: Line;
  /** Whether tones may use colour and styles. */
  readonly color: boolean;
}

/** One screen line: its segments side by side, each in its tone. */
export function SegmentLine({ line, color }: SegmentLineProps) {
  if (line.length === 0 || line.every((s) => s.text === "")) return <Text>{BLANK}</Text>;
  return (
    <Text wrap="truncate-end">
      {line.map((s, i) => <Text key={i} {...toneProps(s.tone, color)}>{s.text}</Text>)}
    </Text>
  );
}
