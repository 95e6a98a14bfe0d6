// Design warnings in the words of the From spec panel: figure names as the panel labels them,
// and the ±window said to be the default allowance (the panel has no field for it). Pure.

const FIGURE_LABEL: Record<string, string> = {
  upperThreshold: "Upper switching point",
  lowerThreshold: "Lower switching point",
  threshold: "Switching point",
  hysteresis: "Deadband",
  gain: "Gain",
  frequency: "Frequency",
  duty: "Duty cycle",
  dutyCycle: "Duty cycle",
};

export function designWarningText(text: string): string {
  let out = text.replace(/^(\w+):/, (all, key: string) => (FIGURE_LABEL[key] ? `${FIGURE_LABEL[key]}:` : all));
  out = out.replace(/the ±([\d.]+) % window/g, "the ±$1 % window (the default allowed error of a design)");
  out = out.replace(/\(maxError ([\d.]+) %\)/g, "(the default allowed error is $1 %)");
  return out;
}
