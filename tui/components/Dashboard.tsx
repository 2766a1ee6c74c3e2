import { Box } from "ink";
import type { Body, Screen } from "../screen.ts";
import { ConvergencePanel } from "./ConvergencePanel.tsx";
import { FooterBar } from "./FooterBar.tsx";
import { HeaderBar } from "./HeaderBar.tsx";
import { HelpPanel } from "./HelpPanel.tsx";
import { PlanetsPanel } from "./PlanetsPanel.tsx";
import { PlotPanel } from "./PlotPanel.tsx";
import { PosteriorPanel } from "./PosteriorPanel.tsx";
import { TabBar } from "./TabBar.tsx";
import { WaitingPanel } from "./WaitingPanel.tsx";

/** Props of {@link Dashboard}. */
export interface DashboardProps {
  /** The laid-out screen (`buildScreen(model)`). */
  readonly screen: Screen;
}

/**
 * The whole dashboard: header, tabs, the current view and the footer, with
 * the body filling the rows between so the footer stays at the bottom.
 */
export function Dashboard({ screen }: DashboardProps) {
  const { color } = screen;
  const bodyHeight = Math.max(0, screen.rows - screen.header.length - 2);
  return (
    <Box flexDirection="column" width={screen.columns}>
      <HeaderBar lines={screen.header} color={color} />
      <TabBar line={screen.tabs} color={color} />
      <Box flexDirection="column" height={bodyHeight} overflow="hidden">
        {bodyView(screen.body, color)}
      </Box>
      <FooterBar line={screen.footer} color={color} />
    </Box>
  );
}

/** The panel for the body's kind (a plain function, not a component). */
function bodyView(body: Body, color: boolean) {
  switch (body.kind) {
    case "waiting":
      return <WaitingPanel body={body} color={color} />;
    case "help":
      return <HelpPanel body={body} color={color} />;
    case "convergence":
      return <ConvergencePanel body={body} color={color} />;
    case "posterior":
      return <PosteriorPanel body={body} color={color} />;
    case "pair":
    case "trace":
      return <PlotPanel body={body} color={color} />;
    case "planets":
      return <PlanetsPanel body={body} color={color} />;
  }
}
