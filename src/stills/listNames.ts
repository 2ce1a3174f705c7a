/**
 * Up to `max` names joined by commas, then "and N more": how the stills messages name photos.
 * Pure; throws nothing.
 * @example listNames(['a.jpg', 'b.jpg', 'c.jpg', 'd.jpg']) === 'a.jpg, b.jpg, c.jpg and 1 more'
 */
export function listNames(names: readonly string[], max = 3): string {
  return `${names.slice(0, max).join(', ')}${names.length > max ? ` and ${names.length - max} more` : ''}`;
}
