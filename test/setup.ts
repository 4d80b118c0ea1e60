import fc from 'fast-check';

// Property tests run from one fixed seed so a CI run is repeatable; set
// FC_SEED=random (or a number) to explore other cases on a workstation.
const chosen = process.env.FC_SEED;
if (chosen !== 'random') fc.configureGlobal({ seed: chosen ? Number(chosen) : 20261201 });
