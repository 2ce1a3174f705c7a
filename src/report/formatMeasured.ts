/**
 * Formats a measured value with its standard error for people: the error is rounded to two
 * significant digits and the value to the same decimal place ("10.21 ± 0.05"), following the
 * usual convention of the GUM (JCGM 100:2008, §7.2.6: no more than two significant digits for
 * the uncertainty). Very large or small numbers share one power of ten, written with Unicode
 * superscripts: "2.41 ± 0.03 × 10⁻¹²". Without a standard error the value gets `digits`
 * significant digits. Non-finite values print as "n/a".
 * Units are the caller's business (see figureCatalogue.ts); this only formats numbers.
 * Never throws.
 * @example formatMeasured(2.4137e-12, 3.2e-14) === '2.414 ± 0.032 × 10⁻¹²'
 * @example formatMeasured(10212.4, 48.9) === '10212 ± 49'
 */
export function formatMeasured(value: number, stdErr?: number | null, options: { digits?: number; scientific?: boolean } = {}): string {
  if (!Number.isFinite(value)) return 'n/a';
  const digits = options.digits ?? 3;
  const hasErr = stdErr !== undefined && stdErr !== null && Number.isFinite(stdErr) && stdErr > 0;
  const magnitude = Math.max(Math.abs(value), hasErr ? (stdErr as number) : 0);
  const scientific = options.scientific ?? (magnitude !== 0 && (magnitude < 1e-3 || magnitude >= 1e6));
  const exponent = scientific && magnitude !== 0 ? Math.floor(Math.log10(Math.abs(value) || magnitude)) : 0;
  const scale = Math.pow(10, exponent);
  const v = value / scale;
  let text: string;
  if (hasErr) {
    const e = (stdErr as number) / scale;
    const decimals = Math.min(12, Math.max(0, 1 - Math.floor(Math.log10(e))));
    text = `${fixed(v, decimals)} ± ${fixed(e, decimals)}`;
  } else {
    text = v === 0 ? '0' : fixed(v, Math.min(12, Math.max(0, digits - 1 - Math.floor(Math.log10(Math.abs(v))))));
  }
  return exponent === 0 ? text : `${text} × 10${superscript(exponent)}`;
}

function fixed(x: number, decimals: number): string {
  const s = x.toFixed(decimals);
  return s === '-0' || /^-0\.0*$/.test(s) ? s.slice(1) : s;
}

const SUPERSCRIPT: Record<string, string> = {
  '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹',
};

function superscript(n: number): string {
  return String(n).split('').map((c) => SUPERSCRIPT[c] ?? c).join('');
}
