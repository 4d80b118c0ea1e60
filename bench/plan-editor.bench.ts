// Plan editor: how long after a keystroke the new nominal and worst-case
// figures can be drawn, for each demo chain. The editor's quick pass is the
// plan check, the load and the targets with one Monte Carlo trial (the worst
// case and sensitivities are all of it); the statistical band follows in a
// worker. Goal: under 200 ms per keystroke. Figures only; nothing fails a build.
// Times are this process's CPU time (process.cpuUsage), not wall time: on a
// shared, loaded machine wall time mostly measures the other jobs.
import { readFileSync } from 'node:fs';
import { computeTargets } from '../src/analysis/targets.js';
import { parseDraft, serialiseDraft, setAt } from '../src/plan/draft.js';
import { checkPlanText, loadPlanText } from '../src/plan/load.js';
import { cpuMs, median } from './timing.js';

const rounds = 15;
const goalMs = 200;

for (const file of ['demo/exciter.plan.json', 'demo/line-driver.plan.json']) {
  const draft = parseDraft(readFileSync(file, 'utf8'));
  const quick: number[] = [];
  const full: number[] = [];
  for (let i = 0; i < rounds + 2; i++) {
    // A keystroke: the title changed (a new text and a new plan object, so no memo helps).
    const text = serialiseDraft(setAt(draft, ['title'], `edit ${i}`));
    const q = cpuMs(() => {
      if (checkPlanText(text, file).length > 0) throw new Error(`${file} does not load`);
      computeTargets(loadPlanText(text, file), { trials: 1, seed: 1 });
    });
    if (i >= 2) quick.push(q);
    if (i >= 2 && i < 5) full.push(cpuMs(() => computeTargets(loadPlanText(text, file), { trials: 10_000, seed: 1 })));
  }
  const q = median(quick);
  const f = median(full);
  console.log(
    `${file}: quick pass (check + load + nominal + worst case) median ${q.toFixed(1)} ms, p-max ${Math.max(...quick).toFixed(1)} ms (goal ${goalMs} ms: ${q <= goalMs ? 'met' : 'missed'}); full 10,000-trial pass ${f.toFixed(0)} ms in the worker; quick/full ${(q / f).toFixed(3)}`,
  );
}
