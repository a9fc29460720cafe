/**
 * The panels the window mounts after the System view's first frame (App.svelte): the Plan editor,
 * Budget, Timeline, status line, Windows view, Survey view, the checks and the route panel, with what they
 * need (d3, the check store, the Timeline's extra lanes). One dynamic import of this module is a
 * chunk of its own, so the first 3D frame waits neither for parsing nor for mounting them.
 */
export { default as PlanEditor } from './components/PlanEditor.svelte';
export { default as BudgetPanel } from './components/BudgetPanel.svelte';
export { default as Timeline } from './components/Timeline.svelte';
export { default as StatusLine } from './components/StatusLine.svelte';
export { default as WindowsView } from './components/WindowsView.svelte';
export { default as SurveyView } from './components/SurveyView.svelte';
export { default as GameStepPanel } from './components/GameStepPanel.svelte';
export { default as StabilityPanel } from './components/StabilityPanel.svelte';
export { default as StabilityCharts } from './components/StabilityCharts.svelte';
export { default as RoutePanel } from './components/RoutePanel.svelte';
export { AnalysisClient } from './analysis/client.ts';
export { CheckStore, isCurrentForPlan, isCurrentForSystem } from './analysis/checkStore.ts';
export { retimeBurn } from './plan/edits.ts';

import type { GameStepResult } from '../../core/gamestep/index.ts';
import type { RetargetOutput } from './analysis/checkJobs.ts';
import { GameStepLanes } from './gamestep/errorChart.ts';
import { errorLanes } from './gamestep/errorSeries.ts';
import { physicsCaption } from './gamestep/physicsForm.ts';
import { RetargetLane, stackExtras } from './handoff/retargetLane.ts';
import { retargetLaneData } from './handoff/retargetSeries.ts';
import type { TimelineExtra } from './timeline/timelineChart.ts';

/** The Timeline's extra lanes: the game-step check's errors and the retargeted flight's, each when shown. */
export function timelineExtras(gameStep: GameStepResult | null, retarget: RetargetOutput | null): TimelineExtra | null {
  const gameLanes = gameStep ? new GameStepLanes(errorLanes(gameStep), physicsCaption(gameStep.physics)) : null;
  const retargetLane = retarget ? new RetargetLane(retargetLaneData(retarget.retarget), physicsCaption(retarget.retarget.physics)) : null;
  return stackExtras([gameLanes, retargetLane]);
}
