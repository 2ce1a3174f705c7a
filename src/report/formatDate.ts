/**
 * An ISO-8601 timestamp as "2025-03-14 10:20:00 UTC" for report headers; text that does not
 * parse as a date is returned unchanged (it is escaped by the caller like any other string).
 * Never throws.
 * @example formatDate('2025-03-14T10:20:00.000Z') === '2025-03-14 10:20:00 UTC'
 */
export function formatDate(iso: string): string {
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : d.toISOString().replace('T', ' ').replace(/(\.\d+)?Z$/, ' UTC');
}
