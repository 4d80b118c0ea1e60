import { useState } from 'react';
import { moveSelection } from '../components/scroll-window.js';

export type PlanPanel = 'targets' | 'warnings';

/** The plan screen's view state: which panel has the keys, the selected target, the warnings' scroll. */
export function usePlanScreenState(targetCount: number, warningCount: number, warningRows: number) {
  const [panel, setPanel] = useState<PlanPanel>('targets');
  const [selected, setSelected] = useState(0);
  const [warningStart, setWarningStart] = useState(0);
  const [isHelpOpen, setHelpOpen] = useState(false);
  return {
    panel,
    selected,
    warningStart,
    isHelpOpen,
    toggleHelp: () => setHelpOpen((open) => !open),
    closeHelp: () => setHelpOpen(false),
    switchPanel: () => setPanel((p) => (p === 'targets' && warningCount > 0 ? 'warnings' : 'targets')),
    /** Move in the focused panel: the selection in the table, the scroll in the warnings. */
    move: (delta: number) => {
      if (panel === 'targets') setSelected((s) => moveSelection(s, delta, targetCount));
      else setWarningStart((s) => Math.max(0, Math.min(Math.max(0, warningCount - warningRows), s + delta)));
    },
    moveTo: (where: 'first' | 'last') => {
      if (panel === 'targets') setSelected(where === 'first' ? 0 : Math.max(0, targetCount - 1));
      else setWarningStart(where === 'first' ? 0 : Math.max(0, warningCount - warningRows));
    },
  };
}

export type PlanScreenState = ReturnType<typeof usePlanScreenState>;
