/**
 * Header facts of a sample's netlist and model files: one function, used by `motional netlist`
 * and by the catalogue downloads, so both produce byte-identical files.
 */
import type { SampleResult } from '../extract/types.ts';
import type { Part } from '../schema/part.ts';
import type { NetlistInfo } from '../models/netlist-spice.ts';

/** How a sample's parameters were obtained, as the netlist header says it. */
export function methodOf(s: SampleResult): string {
  return s.fit.converged
    ? `complex least squares over the sample's sweeps (${s.fit.points} points, ${s.fit.iterations} iterations)`
    : `closed-form and peak methods (least-squares fit not used: ${s.fit.reason})`;
}

/** Netlist header facts of one sample of a part. */
export function netlistInfoOf(part: Part, sample: SampleResult, labels: NetlistInfo['labels']): NetlistInfo {
  const record = part.samples.find((s) => s.id === sample.sample);
  return {
    partId: part.id,
    title: part.title,
    kind: part.kind,
    sample: sample.sample,
    labels,
    temperatureC: sample.temperatureC,
    driveW: sample.driveW,
    date: record?.measured,
    method: methodOf(sample),
    fitResidual: sample.fit.converged ? sample.fit.rmsResidual : undefined,
    validSpanHz: sample.spanHz.max > sample.spanHz.min ? sample.spanHz : undefined,
  };
}
