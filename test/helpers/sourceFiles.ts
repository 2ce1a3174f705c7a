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

/** Lower-case, hyphenated words: the shape of warning codes and exclusion reasons. */
const CODE_WORD = /^[a-z][a-z0-9]*(-[a-z0-9]+)*$/;

function codeWordsIn(node: ts.Node): string[] {
  const out: string[] = [];
  const visit = (n: ts.Node): void => {
    if ((ts.isStringLiteral(n) || ts.isNoSubstitutionTemplateLiteral(n)) && CODE_WORD.test(n.text)) out.push(n.text);
    // only the value chosen, not strings used to decide it (e.g. a regex or a test in a condition)
    if (ts.isConditionalExpression(n)) { visit(n.whenTrue); visit(n.whenFalse); return; }
    if (ts.isBinaryExpression(n) && n.operatorToken.kind === ts.SyntaxKind.QuestionQuestionToken) { visit(n.right); return; }
    if (ts.isParenthesizedExpression(n)) { visit(n.expression); return; }
    // values produced per element: list.map((u) => (u === null ? null : 'unreadable'))
    if (ts.isCallExpression(n)) { for (const arg of n.arguments) if (ts.isArrowFunction(arg) && !ts.isBlock(arg.body)) visit(arg.body); }
  };
  visit(node);
  return out;
}

export interface CodeUse {
  code: string;
  file: string;
  line: number;
}

/**
 * Warning codes a file writes: the first argument of a call to a function named `warn`, and the
 * value of a `code:` property (lower-case hyphenated words only; KerrError codes are upper case).
 */
export function warningCodesIn(file: string): CodeUse[] {
  const source = parse(file);
  const found: CodeUse[] = [];
  const add = (node: ts.Node): void => {
    const line = source.getLineAndCharacterOfPosition(node.getStart()).line + 1;
    for (const code of codeWordsIn(node)) found.push({ code, file, line });
  };
  const visit = (node: ts.Node): void => {
    if (ts.isCallExpression(node) && ts.isIdentifier(node.expression) && node.expression.text === 'warn' && node.arguments[0]) add(node.arguments[0]);
    if (ts.isPropertyAssignment(node) && node.name.getText(source) === 'code') add(node.initializer);
    ts.forEachChild(node, visit);
  };
  visit(source);
  return found;
}

/**
 * Exclusion reasons a file assigns: values given to a variable, element or property whose name
 * says excluded/reason (`excluded[f] = 'spark'`, `reason = 'clipped'`, `excludedReason: ...`,
 * `preExcluded: ...`), and what a function named `reasonFor` returns.
 */
export function exclusionReasonsIn(file: string): CodeUse[] {
  const source = parse(file);
  const found: CodeUse[] = [];
  const named = /exclu|^reason$|reasonFor/i;
  const add = (node: ts.Node): void => {
    const line = source.getLineAndCharacterOfPosition(node.getStart()).line + 1;
    for (const code of codeWordsIn(node)) found.push({ code, file, line });
  };
  const targetName = (n: ts.Expression): string => (ts.isElementAccessExpression(n) ? targetName(n.expression) : ts.isPropertyAccessExpression(n) ? n.name.text : n.getText(source));
  const visit = (node: ts.Node, inReasonFor: boolean): void => {
    if (ts.isBinaryExpression(node) && node.operatorToken.kind === ts.SyntaxKind.EqualsToken && named.test(targetName(node.left))) add(node.right);
    if (ts.isVariableDeclaration(node) && node.initializer && named.test(node.name.getText(source))) add(node.initializer);
    if (ts.isPropertyAssignment(node) && /exclu/i.test(node.name.getText(source))) add(node.initializer);
    if (inReasonFor && ts.isReturnStatement(node) && node.expression) add(node.expression);
    const entering = ts.isFunctionDeclaration(node) && node.name?.text === 'reasonFor';
    ts.forEachChild(node, (child) => visit(child, inReasonFor || entering));
  };
  visit(source, false);
  return found;
}
