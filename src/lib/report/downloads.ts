/**
 * The model downloads of a part: netlist with all modes, main mode only, model Touchstone and
 * parameters JSON and CSV of the default sample, and netlist and parameters of every other sample
 * with modes. The netlists come from {@link sampleNetlist}, the function `motional netlist`
 * prints with, so a download and the command's output are byte-identical.
 */
import type { PartResult, SampleResult } from '../extract/types.ts';
import type { Part } from '../schema/part.ts';
import { formatNetlist } from '../models/netlist-spice.ts';
import { formatModelTouchstone } from '../models/model-touchstone.ts';
import { modelFromResult } from './netlist-model.ts';
import { netlistInfoOf } from './netlist-info.ts';
import { formatParametersCsv, formatParametersJson } from './parameters-export.ts';

/** One download file: its name under downloads/<id>/, a label for the page, and its text. */
export interface DownloadFile {
  name: string;
  label: string;
  content: string;
}

/**
 * The SPICE subcircuit of one sample, as `motional netlist PART [--sample ID]` prints it:
 * every mode, or the main mode only.
 */
export function sampleNetlist(part: Part, sample: SampleResult, options: { mainModeOnly?: boolean } = {}): string {
  const { model, labels } = modelFromResult(sample);
  return formatNetlist(model, netlistInfoOf(part, sample, labels), { mainModeOnly: options.mainModeOnly });
}

/**
 * The sample the downloads describe by default: the first sample, as `netlist` and `advise`
 * take it; when it has no modes, the first one that has.
 */
export function defaultSample(result: PartResult): SampleResult | undefined {
  return result.samples[0]?.modes.length
    ? result.samples[0]
    : (result.samples.find((s) => s.modes.length > 0) ?? result.samples[0]);
}

function safeName(text: string): string {
  return text.replace(/[^A-Za-z0-9._-]/g, '_');
}

/** The model downloads of one part (see module doc); none when no sample has a mode. */
export function modelDownloads(part: Part, result: PartResult): DownloadFile[] {
  const id = part.id;
  const files: DownloadFile[] = [];
  const first = defaultSample(result);
  const withModes = result.samples.filter((s) => s.modes.length > 0);
  if (first && first.modes.length > 0) {
    files.push({
      name: `${id}.cir`,
      label: `SPICE netlist, all modes (sample ${first.sample})`,
      content: sampleNetlist(part, first),
    });
    files.push({
      name: `${id}-main.cir`,
      label: `SPICE netlist, main mode only (sample ${first.sample})`,
      content: sampleNetlist(part, first, { mainModeOnly: true }),
    });
    const { model, labels } = modelFromResult(first);
    const ts = formatModelTouchstone(model, netlistInfoOf(part, first, labels));
    if (ts.ok)
      files.push({
        name: `${id}-model.s1p`,
        label: `Model as Touchstone S-parameters (sample ${first.sample})`,
        content: ts.text,
      });
    const date = part.samples.find((s) => s.id === first.sample)?.measured;
    files.push({
      name: `${id}-parameters.json`,
      label: `Parameters, JSON (sample ${first.sample})`,
      content: formatParametersJson(first, { partId: id, date }),
    });
    files.push({
      name: `${id}-parameters.csv`,
      label: `Parameters, CSV (sample ${first.sample})`,
      content: formatParametersCsv(first),
    });
    for (const s of withModes) {
      if (s === first) continue;
      const tag = `${id}-${safeName(s.sample)}`;
      const d = part.samples.find((x) => x.id === s.sample)?.measured;
      files.push({
        name: `${tag}.cir`,
        label: `SPICE netlist, all modes (sample ${s.sample})`,
        content: sampleNetlist(part, s),
      });
      files.push({
        name: `${tag}-parameters.json`,
        label: `Parameters, JSON (sample ${s.sample})`,
        content: formatParametersJson(s, { partId: id, date: d }),
      });
      files.push({
        name: `${tag}-parameters.csv`,
        label: `Parameters, CSV (sample ${s.sample})`,
        content: formatParametersCsv(s),
      });
    }
  }
  return files;
}
