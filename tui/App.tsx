import { useApp, useInput, useStdout } from "ink";
import { useEffect, useMemo, useReducer } from "react";
import { Dashboard } from "./components/Dashboard.tsx";
import { initialModel, keysFromInput, reduce } from "./model.ts";
import { buildScreen } from "./screen.ts";
import type { RunSnapshot } from "./snapshot.ts";

/** Shortest allowed time between two reads of the run directory (at most 2 refreshes per second). */
export const MIN_INTERVAL_MS = 500;

/** Props of {@link App}. */
export interface AppProps {
  /** Reads the run directory once; called again `intervalMs` after each read settles. */
  readonly load: () => Promise<RunSnapshot>;
  /** Time between reads in ms. @default 1000 (values below 500 are raised to 500) */
  readonly intervalMs?: number;
  /** Whether colour may be used; false under NO_COLOR. */
  readonly color: boolean;
  /** Called once when the user leaves: `quit` for q, `interrupt` for Ctrl-C. */
  readonly onExit?: (reason: "quit" | "interrupt") => void;
  /** Terminal width override (tests); default: the output stream's columns, following resizes. */
  readonly columns?: number;
  /** Terminal height override (tests); default: the output stream's rows, following resizes. */
  readonly rows?: number;
}

interface SizedStream {
  readonly columns?: number;
  readonly rows?: number;
  on(event: "resize", listener: () => void): unknown;
  off(event: "resize", listener: () => void): unknown;
}

/**
 * The live dashboard: polls `load`, folds snapshots, keys and resizes into
 * the view-model, and draws the current view. The only component that
 * subscribes to anything or reads keys.
 */
export function App({ load, intervalMs = 1000, color, onExit, columns, rows }: AppProps) {
  const { exit } = useApp();
  const { stdout } = useStdout();
  const stream = stdout as unknown as SizedStream;
  const [model, dispatch] = useReducer(
    reduce,
    undefined,
    () =>
      initialModel({
        columns: columns ?? stream.columns ?? 80,
        rows: rows ?? stream.rows ?? 24,
        color,
      }),
  );

  // Size: explicit props win; otherwise follow the terminal.
  useEffect(() => {
    if (columns !== undefined || rows !== undefined) {
      dispatch({
        type: "resize",
        columns: columns ?? stream.columns ?? 80,
        rows: rows ?? stream.rows ?? 24,
      });
      return;
    }
    const onResize = () =>
      dispatch({ type: "resize", columns: stream.columns ?? 80, rows: stream.rows ?? 24 });
    stream.on("resize", onResize);
    return () => {
      stream.off("resize", onResize);
    };
  }, [stream, columns, rows]);

  // Polling: one read at a time, the next one `interval` after the last settled.
  useEffect(() => {
    const interval = Math.max(MIN_INTERVAL_MS, Number.isFinite(intervalMs) ? intervalMs : 1000);
    let stopped = false;
    let timer: ReturnType<typeof setTimeout> | undefined;
    const tick = async () => {
      try {
        const snapshot = await load();
        if (!stopped) dispatch({ type: "snapshot", snapshot });
      } catch (error) {
        const message = error instanceof Error ? error.message : String(error);
        if (!stopped) dispatch({ type: "loadError", message });
      }
      if (!stopped) timer = setTimeout(tick, interval);
    };
    void tick();
    return () => {
      stopped = true;
      if (timer !== undefined) clearTimeout(timer);
    };
  }, [load, intervalMs]);

  useInput((input, key) => {
    if (key.ctrl && input === "c") {
      onExit?.("interrupt");
      exit();
      return;
    }
    for (const k of keysFromInput(input, key)) {
      if (k.kind === "quit") {
        onExit?.("quit");
        exit();
        return;
      }
      dispatch({ type: "key", key: k });
    }
  });

  const screen = useMemo(() => buildScreen(model), [model]);
  return <Dashboard screen={screen} />;
}
