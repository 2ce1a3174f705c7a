/**
 * The href from a report folder to a section of the installed docs/recording-a-run.md, as a
 * relative URL path ("../../node_modules/kerrtrace/docs/recording-a-run.md#avoid-clipping").
 * Relative, so the link keeps working when the install and the report move together; the report
 * also quotes the advice inline for when they do not. Falls back to the bare file name when the
 * install cannot be found. Path segments are percent-encoded; separators become "/".
 * @example guideLink('/proj/out', 'sweep') === '../docs/recording-a-run.md#sweep' (install at /proj)
 */
import { isAbsolute, join, relative, resolve, sep } from 'node:path';
import { GUIDE_FILE } from './guide.js';
import { packageInfo } from './packageInfo.js';

export function guideLink(reportDir: string, anchor: string): string {
  const root = packageInfo().root;
  let target = 'recording-a-run.md';
  if (root !== null) {
    const rel = relative(resolve(reportDir), join(root, GUIDE_FILE));
    target = isAbsolute(rel) ? rel : rel.split(sep).map(encodeURIComponent).join('/');
  }
  return `${target}#${encodeURIComponent(anchor)}`;
}
