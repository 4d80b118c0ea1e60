import { lazy } from 'react';

// The screens behind the bench screen, each loaded the first time it opens: the
// bench screen draws its first frame without parsing the bring-up screen, the
// charts, the review figures or the diagnosis (measured in bench/ui.bench.ts).
export const BringUpScreen = lazy(() => import('./bring-up/bring-up.js').then((m) => ({ default: m.BringUpScreen })));
export const HistoryScreen = lazy(() => import('./history/history.js').then((m) => ({ default: m.HistoryScreen })));
export const BatchScreen = lazy(() => import('./batch/batch.js').then((m) => ({ default: m.BatchScreen })));
export const PlanScreen = lazy(() => import('./plan-screen/plan-screen.js').then((m) => ({ default: m.PlanScreen })));
export const PlanEditorScreen = lazy(() => import('./plan-editor/plan-editor-screen.js').then((m) => ({ default: m.PlanEditorScreen })));
