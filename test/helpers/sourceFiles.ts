/**
 * Reads the project's own TypeScript sources for the architecture tests: every `.ts` file under a
 * folder, its import specifiers (static imports, re-exports, `import()` calls) and its string
 * literals (quotes and template pieces, comments excluded), found with the TypeScript compiler's
 * own parser, so comments, regular expressions and code like `--k` are never mistaken for imports
 * or strings.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import ts from 'typescript';

/** Repository root (this file is test/helpers/sourceFiles.ts). */
export const REPO_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');

/** Every `.ts` file under `folder` (repository-relative, forward slashes), sorted. */
export function tsFilesUnder(folder: string): string[] {
  const out: string[] = [];
  const walk = (dir: string): void => {
    for (const entry of readdirSync(dir, { withFileTypes: true })) {
      const full = join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (entry.isFile() && entry.name.endsWith('.ts')) out.push(relative(REPO_ROOT, full).split('\\').join('/'));
    }
  };
  walk(join(REPO_ROOT, folder));
  return out.sort();
}

function parse(file: string): ts.SourceFile {
  return ts.createSourceFile(file, readFileSync(join(REPO_ROOT, file), 'utf8'), ts.ScriptTarget.Latest, true);
}

export interface ImportFound {
  /** The specifier as written, e.g. '../../media/types.js' or 'node:fs'. */
  specifier: string;
  /** Repository-relative target for relative specifiers ('src/media/types.js'), else the specifier. */
  target: string;
  line: number;
}

/** The modules a file imports or re-exports, and its dynamic `import('...')` calls. */
export function importsOf(file: string): ImportFound[] {
  const source = parse(file);
  const found: ImportFound[] = [];
  const add = (node: ts.Node, spec: ts.Expression | undefined): void => {
    if (!spec || !ts.isStringLiteralLike(spec)) return;
    const specifier = spec.text;
    const target = specifier.startsWith('.')
      ? relative(REPO_ROOT, resolve(REPO_ROOT, dirname(file), specifier)).split('\\').join('/')
      : specifier;
    found.push({ specifier, target, line: source.getLineAndCharacterOfPosition(node.getStart()).line + 1 });
  };
  const visit = (node: ts.Node): void => {
    if (ts.isImportDeclaration(node) || ts.isExportDeclaration(node)) add(node, node.moduleSpecifier);
    else if (ts.isCallExpression(node) && node.expression.kind === ts.SyntaxKind.ImportKeyword) add(node, node.arguments[0]);
    else if (ts.isImportEqualsDeclaration(node) && ts.isExternalModuleReference(node.moduleReference)) add(node, node.moduleReference.expression);
    ts.forEachChild(node, visit);
  };
  visit(source);
  return found;
}

export interface StringFound {
  text: string;
  line: number;
}

/** Every string literal and template piece in a file's code (comments are not code). */
export function stringsOf(file: string): StringFound[] {
  const source = parse(file);
  const found: StringFound[] = [];
  const visit = (node: ts.Node): void => {
    if (ts.isStringLiteral(node) || ts.isNoSubstitutionTemplateLiteral(node) || ts.isTemplateHead(node)
      || ts.isTemplateMiddle(node) || ts.isTemplateTail(node)) {
      found.push({ text: node.text, line: source.getLineAndCharacterOfPosition(node.getStart()).line + 1 });
    }
    ts.forEachChild(node, visit);
  };
  visit(source);
  return found;
}

/** Property reads on a bare name (`process.env`, `Date.now`) in a file's code, with their line. */
export function propertyAccessesOf(file: string): { object: string; property: string; line: number }[] {
  const source = parse(file);
  const found: { object: string; property: string; line: number }[] = [];
  const visit = (node: ts.Node): void => {
    if (ts.isPropertyAccessExpression(node) && ts.isIdentifier(node.expression)) {
      found.push({ object: node.expression.text, property: node.name.text, line: source.getLineAndCharacterOfPosition(node.getStart()).line + 1 });
    }
    ts.forEachChild(node, visit);
  };
  visit(source);
  return found;
}
