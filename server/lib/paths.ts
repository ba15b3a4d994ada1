import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

// The project's root (the folder of its package.json), found by walking up from this file: the same folder whether
// the server runs from its TypeScript sources (server/lib/) or compiled (dist-server/, one bundle), so templates,
// fonts and the client are found from either.
function findRoot(from: string): string {
  for (let dir = from; ; dir = path.dirname(dir)) {
    if (fs.existsSync(path.join(dir, 'package.json')) && fs.existsSync(path.join(dir, 'templates')))
      return dir;
    if (path.dirname(dir) === dir)
      throw new Error(`no project root (package.json and templates/) above ${from}`);
  }
}

export const PROJECT_ROOT = findRoot(path.dirname(fileURLToPath(import.meta.url)));

/** A path inside the project, e.g. projectPath('templates', 'pdf'). */
export const projectPath = (...parts: string[]) => path.join(PROJECT_ROOT, ...parts);
