// The invented plan the review benchmark fills its synthetic log with: an
// oscillator and seventeen buffer stages, each taken from the triangle, so
// the plan has sixty-odd checks. Invented values, not any real board.

const buffers = Array.from({ length: 17 }, (_, i) => ({
  id: `buf${i + 1}`,
  kind: 'noninverting-amp',
  input: 'osc.triangle',
  parts: { Rg: '10k 1%', Rf: `${[1, 2.2, 3.3, 4.7, 6.8][i % 5]}k 1%` },
}));

export const benchPlan = {
  plan: 'bench-review',
  title: 'Synthetic benchmark board (invented values)',
  rails: [
    { id: '+12V', nominal: '12 V', tol: '3%' },
    { id: '-12V', nominal: '-12 V', tol: '3%' },
  ],
  idleCurrent: { max: '80 mA' },
  opamp: { gbw: '3 MHz', slew: '2 V/us', headroom: '1.5 V', maxSupply: '18 V' },
  uncertainty: { V: '0.5% + 2 mV', A: '1% + 0.1 mA', Hz: '0.05%', ohm: '1% + 1 ohm', 'V/V': '0.05%', '1': '0.5%' },
  stages: [{ id: 'osc', kind: 'schmitt-integrator', parts: { R1: '12k 1%', R2: '27k 1%', Rt: '15k 1%', Ct: '10n 5%' } }, ...buffers],
};
