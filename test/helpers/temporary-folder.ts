// Temporary folders for tests, removed when the test file is done (each file
// calls afterAll(removeTemporaryFolders)): test runs had left some 16
// folders each in the system's temporary folder.
import { chmodSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const made: string[] = [];

/** A new folder in the system's temporary folder, its name starting with prefix. */
export function temporaryFolder(prefix: string): string {
  const folder = mkdtempSync(join(tmpdir(), prefix));
  made.push(folder);
  return folder;
}

export function removeTemporaryFolders(): void {
  for (const folder of made.splice(0)) {
    try {
      // A test may have made it read-only.
      chmodSync(folder, 0o700);
      rmSync(folder, { recursive: true, force: true });
    } catch {
      // What cannot be removed stays; a test's own result does not depend on it.
    }
  }
}
