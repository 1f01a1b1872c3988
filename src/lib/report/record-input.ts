/**
 * What the report layer needs of a loaded record: the validated part, its issues and its sweeps
 * as read and converted. The pipeline's LoadedPart and LoadedSweep satisfy these shapes; the
 * report reads no file itself.
 */
import type { Issue } from '../issues.ts';
import type { Part, SweepRef } from '../schema/part.ts';
import type { ImpedanceSweep } from '../sweep/sweep.ts';

/** One measured sweep of a sample. */
export interface RecordSweep {
  /** Id of the sample the sweep belongs to. */
  sampleId: string;
  /** Index of the sweep in the sample's `sweeps` list. */
  index: number;
  ref: SweepRef;
  /** Path of the sweep file (for file sizes). */
  file: string;
  /** Impedance of the part, Ω; absent when unreadable. */
  impedance?: ImpedanceSweep;
  /** Reference impedances of a Touchstone file, Ω. */
  network?: { z0Ohm: ArrayLike<number> };
}

/** A loaded part record. */
export interface RecordInput {
  /** Path of part.yaml, for messages. */
  yamlFile: string;
  /** The validated record; absent when it has errors. */
  part?: Part;
  issues: Issue[];
  sweeps: RecordSweep[];
}
