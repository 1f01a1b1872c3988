/**
 * FileSource: the little file access the pipeline needs, behind an interface so the loaders
 * can run on an in-memory tree in tests and on node:fs in the CLI.
 *
 * Paths are plain strings as the user gave them (relative to the working directory or
 * absolute); they are never rewritten, so messages show the same paths.
 */
import { lstat, readFile, readdir, realpath, stat } from 'node:fs/promises';

/** What a path is. `other` covers FIFOs, sockets and devices, which are never read. */
export type FileKind = 'file' | 'directory' | 'other';

/** Result of {@link FileSource.stat}. */
export interface FileStat {
  kind: FileKind;
  /** Size in bytes (0 for directories). */
  sizeBytes: number;
  /** True when the path itself is a symbolic link (the other fields describe its target). */
  isSymlink: boolean;
}

export interface FileSource {
  /** Whole file decoded as UTF-8 (invalid bytes become U+FFFD). Rejects when unreadable. */
  readText(path: string): Promise<string>;
  /** Kind and size of a path, following links; undefined when it does not exist or a link dangles. */
  stat(path: string): Promise<FileStat | undefined>;
  /** Entry names of a directory (not sorted). Rejects when it is not a readable directory. */
  list(dir: string): Promise<string[]>;
  /** Canonical absolute path with every link resolved. Rejects when the path does not exist. */
  realPath(path: string): Promise<string>;
}

function kindOf(s: { isFile(): boolean; isDirectory(): boolean }): FileKind {
  return s.isFile() ? 'file' : s.isDirectory() ? 'directory' : 'other';
}

/** {@link FileSource} on the local file system (node:fs). */
export const nodeFileSource: FileSource = {
  readText: (path) => readFile(path, 'utf8'),
  async stat(path) {
    try {
      const link = await lstat(path);
      const target = link.isSymbolicLink() ? await stat(path) : link;
      const kind = kindOf(target);
      return { kind, sizeBytes: kind === 'file' ? target.size : 0, isSymlink: link.isSymbolicLink() };
    } catch {
      return undefined;
    }
  },
  list: (dir) => readdir(dir),
  realPath: (path) => realpath(path),
};
