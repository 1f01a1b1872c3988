/** A capacitance for messages, pF with a true minus sign: "−7.00". */
export function picofarads(f: number): string {
  const v = f * 1e12;
  return `${v < 0 ? '−' : ''}${Math.abs(v).toPrecision(3)}`;
}
