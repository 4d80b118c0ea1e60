// Plan editor: how long after a keystroke the new nominal and estimated bands
// can be drawn, for each demo chain. The editor's quick pass is the plan check,
// the load and `quickTargets` (nominal, bands from the sensitivities); the
// searched worst case and the statistical band follow in a worker. Beside it,
// the quick pass as it was (the targets with one Monte Carlo trial: the whole
// worst-case search). Goal: under 200 ms per keystroke (issue 15: a fraction of
// that). Figures only; nothing fails a build.
// Times are this process's CPU time (process.cpuUsage), not wall time: on a
// shared, loaded machine wall time mostly measures the other jobs.
import { readFileSync } from 'node:fs';
import { quickTargets } from '../src/analysis/quick-targets.js';
import { computeTargets } from '../src/analysis/targets.js';
import { parseDraft, serialiseDraft, setAt } from '../src/plan/draft.js';
import { checkPlanText, loadPlanText } from '../src/plan/load.js';
import { cpuMs, median } from './timing.js';

const rounds = 15;
const goalMs = 200;

for (const file of ['demo/exciter.plan.json', 'demo/line-driver.plan.json']) {
  const draft = parseDraft(readFileSync(file, 'utf8'));
  const quick: number[] = [];
  const searched: number[] = [];
  const full: number[] = [];
  for (let i = 0; i < rounds + 2; i++) {
    // A keystroke: the title changed (a new text and a new plan object, so no memo helps).
    const text = serialiseDraft(setAt(draft, ['title'], `edit ${i}`));
    const q = cpuMs(() => {
      if (checkPlanText(text, file).length > 0) throw new Error(`${file} does not load`);
      quickTargets(loadPlanText(text, file));
    });
    if (i >= 2) quick.push(q);
    const w = cpuMs(() => {
      if (checkPlanText(text, file).length > 0) throw new Error(`${file} does not load`);
      computeTargets(loadPlanText(text, file), { trials: 1, seed: 1 });
    });
    if (i >= 2) searched.push(w);
    if (i >= 2 && i < 5) full.push(cpuMs(() => computeTargets(loadPlanText(text, file), { trials: 10_000, seed: 1 })));
  }
  const q = median(quick);
  const w = median(searched);
  const f = median(full);
  console.log(
    `${file}: quick pass (check + load + nominal + estimated bands) median ${q.toFixed(1)} ms, p-max ${Math.max(...quick).toFixed(1)} ms (goal ${goalMs} ms: ${q <= goalMs ? 'met' : 'missed'}); with the worst-case search instead ${w.toFixed(1)} ms (${(w / q).toFixed(1)}× the quick pass); full 10,000-trial pass ${f.toFixed(0)} ms in the worker; quick/full ${(q / f).toFixed(3)}`,
  );
}
