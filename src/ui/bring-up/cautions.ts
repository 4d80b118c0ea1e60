/**
 * The cautions shown at the start of every bring-up sitting, in our own words.
 * They are reminders, not a safety procedure: local codes, the lab's rules and
 * licensed practice come first.
 */
export const cautions: readonly string[] = [
  'First power goes through a bench supply with its current limit set just above the idle-current limit; never straight from a high-current source.',
  'Check supply polarity and each rail against the plan before connecting: a reversed rail can destroy parts in milliseconds.',
  'Regulators, output transistors and shorted parts get hot enough to burn: touch only after power has been off a while, or measure the temperature.',
  'Large capacitors keep their charge after power-off: discharge them through a resistor and measure before touching or soldering.',
  'Anything mains-powered (supplies, the board itself) is dangerous: keep covers on, use an isolated supply and never probe mains with a grounded scope.',
  'These notes do not replace local electrical codes, your lab rules or licensed practice: follow those first.',
];

/** The same cautions in a few words each, for terminals too small for the full text. */
export const shortCautions: readonly string[] = [
  'First power: a current-limited supply only.',
  "Check every rail's polarity before connecting.",
  'Hot parts burn: wait or measure before touching.',
  'Discharge big capacitors before touching.',
  'Mains: covers on, isolated supply, no earthed probe.',
  'Local codes and licensed practice come first.',
];

/** What to do when the idle current is above its limit. */
export const powerOffSteps: readonly string[] = [
  'Switch the supply off now.',
  'Let hot parts cool and discharge large capacitors before touching the board.',
  'Look for solder bridges, reversed parts (diodes, electrolytics, transistors) and wrong values near the rails.',
  'Measure each rail to ground again, unpowered, before applying power once more through the current limit.',
];
