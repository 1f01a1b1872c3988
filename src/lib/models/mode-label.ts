/**
 * The one wording of a mode's name, used by the command line, the part data and the pages:
 * "fundamental", "overtone 3", "spurious (near fundamental)", "spurious (near overtone 3)".
 */

/** Name of an overtone order: "fundamental" for 1, else "overtone N". */
export function overtoneLabel(overtone: number): string {
  return overtone === 1 ? 'fundamental' : `overtone ${overtone}`;
}

/** Short name of a mode (see module doc). */
export function modeLabel(m: { overtone: number; spurious: boolean }): string {
  const order = overtoneLabel(m.overtone);
  return m.spurious ? `spurious (near ${order})` : order;
}
