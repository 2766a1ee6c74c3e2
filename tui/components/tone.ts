/**
 * Ink text props for each tone, shared by the components.
 * @module
 */

import type { Tone } from "../screen.ts";

/** Style props Ink's `<Text>` accepts that tones use. */
export interface ToneProps {
  readonly color?: string;
  readonly bold?: boolean;
  readonly dimColor?: boolean;
  readonly inverse?: boolean;
}

const COLORED: Readonly<Record<Tone, ToneProps>> = {
  plain: {},
  strong: { bold: true },
  dim: { dimColor: true },
  accent: { color: "cyan" },
  good: { color: "green" },
  warn: { color: "yellow" },
  bad: { color: "red", bold: true },
  cursor: { inverse: true },
};

/**
 * Props for `tone`: colours and styles when `color` is true, nothing at all
 * when it is false (NO_COLOR), so plain text carries all the meaning.
 */
export function toneProps(tone: Tone, color: boolean): ToneProps {
  return color ? COLORED[tone] : {};
}
