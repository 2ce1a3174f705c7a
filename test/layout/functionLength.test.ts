/**
 * Rooms a newcomer can read: no function (declaration, expression, arrow or method) longer than
 * 80 lines in the folders listed, measured from its first to its last line with the TypeScript
 * compiler's own parser. 80 lines is the house limit (DEVELOPERS.md, "Rules of the house"); add a
 * folder here once its long functions are split.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';

const ROOT = join(import.meta.dirname, '..', '..');
const FOLDERS = ['src/io', 'src/core/sync', 'src/pipeline', 'src/stills', 'cli/optionParsers.ts'];
const MAX_LINES = 80;

function tsFiles(path: string): string[] {
  if (!statSync(path).isDirectory()) return path.endsWith('.ts') ? [path] : [];
  return readdirSync(path).flatMap((name) => tsFiles(join(path, name)));
}

/** Every function in a source text longer than `maxLines`, as "name (N lines, line L)". */
function longFunctions(fileName: string, text: string, maxLines: number): string[] {
  const source = ts.createSourceFile(fileName, text, ts.ScriptTarget.Latest, true);
  const found: string[] = [];
  const visit = (node: ts.Node): void => {
    if (ts.isFunctionDeclaration(node) || ts.isFunctionExpression(node) || ts.isArrowFunction(node) || ts.isMethodDeclaration(node)) {
      const first = source.getLineAndCharacterOfPosition(node.getStart(source)).line;
      const last = source.getLineAndCharacterOfPosition(node.getEnd()).line;
      const lines = last - first + 1;
      const name = 'name' in node && node.name !== undefined ? node.name.getText(source) : '(anonymous)';
      if (lines > maxLines) found.push(`${name} (${lines} lines, line ${first + 1})`);
    }
    ts.forEachChild(node, visit);
  };
  visit(source);
  return found;
}

describe('function length', () => {
  it('the checker sees a long function (so the check below can fail)', () => {
    const body = Array.from({ length: MAX_LINES }, (_, i) => `  const x${i} = ${i};`).join('\n');
    expect(longFunctions('long.ts', `function long(): void {\n${body}\n}\n`, MAX_LINES)).toEqual([`long (${MAX_LINES + 2} lines, line 1)`]);
    expect(longFunctions('short.ts', 'const f = (): number => 1;\n', MAX_LINES)).toEqual([]);
  });

  for (const folder of FOLDERS) {
    it(`${folder}: no function over ${MAX_LINES} lines`, () => {
      const long = tsFiles(join(ROOT, folder)).flatMap((file) => longFunctions(file, readFileSync(file, 'utf8'), MAX_LINES).map((f) => `${relative(ROOT, file)}: ${f}`));
      expect(long).toEqual([]);
    });
  }
});
